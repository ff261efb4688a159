using System.ComponentModel.DataAnnotations;
using Microsoft.Extensions.Configuration;
using ModelWatch.Daemon.Options;
using ModelWatch.Store.Configuration;

namespace ModelWatch.Daemon.Hosting;

/// <summary>
/// Checks the daemon's whole configuration before anything starts, so every problem in every section is listed at
/// once (a Daemon error does not hide a Notifications one): values that do not convert, values out of range, settings
/// that contradict each other, and keys that are no longer read. Keys nothing reads come back as warnings.
/// </summary>
public static class DaemonSettings
{
    /// <summary>The daemon's sections and the options class each binds to.</summary>
    public static IReadOnlyDictionary<string, Type> Sections { get; } = new Dictionary<string, Type>(StringComparer.Ordinal)
    {
        [DaemonOptions.Section] = typeof(DaemonOptions),
        [HttpOptions.Section] = typeof(HttpOptions),
        [WebOptions.Section] = typeof(WebOptions),
        [RetentionOptions.Section] = typeof(RetentionOptions),
        [TelemetryOptions.Section] = typeof(TelemetryOptions),
        [SpecsOptions.Section] = typeof(SpecsOptions),
        [NotificationOptions.Section] = typeof(NotificationOptions),
    };

    // Keys of earlier releases: set, they would now be ignored in silence, so they are errors that say what replaced them.
    private static readonly (string Prefix, string Replacement)[] Removed =
    [
        ("Health", "the health endpoint moved to Http:Enabled and Http:Urls (paths /healthz/live and /healthz/ready)"),
        ("Telemetry:PrometheusHost", "the scrape endpoint is /metrics on Http:Urls (set Http:Enabled and Telemetry:PrometheusEnabled)"),
        ("Telemetry:PrometheusPort", "the scrape endpoint is /metrics on Http:Urls (set Http:Enabled and Telemetry:PrometheusEnabled)"),
    ];

    /// <summary>Every problem (the daemon must not start) and every warning (unknown keys), in one pass.</summary>
    public static (IReadOnlyList<string> Problems, IReadOnlyList<string> Warnings) Audit(IConfiguration configuration)
    {
        ArgumentNullException.ThrowIfNull(configuration);
        var problems = new List<string>();
        foreach ((string prefix, string replacement) in Removed)
        {
            IConfigurationSection section = configuration.GetSection(prefix);
            if (section.Value is not null || section.GetChildren().Any())
            {
                problems.Add($"{prefix} is no longer read: {replacement}");
            }
        }

        var bound = new Dictionary<string, object>(StringComparer.Ordinal);
        foreach ((string name, Type type) in Sections)
        {
            object options = Activator.CreateInstance(type)!;
            try
            {
                configuration.GetSection(name).Bind(options);
            }
            catch (InvalidOperationException ex)
            {
                problems.Add($"{name}: {ex.Message}{(ex.InnerException is { } inner ? " " + inner.Message : string.Empty)}");
                continue;
            }

            bound[name] = options;
            var results = new List<ValidationResult>();
            if (!Validator.TryValidateObject(options, new ValidationContext(options), results, validateAllProperties: true))
            {
                problems.AddRange(results.Select(r => $"{name}:{string.Join(",", r.MemberNames)}: {r.ErrorMessage}"));
            }
        }

        if (bound.GetValueOrDefault(NotificationOptions.Section) is NotificationOptions notifications)
        {
            var targets = new NotificationOptionsValidator().Validate(null, new NotificationOptions { Targets = notifications.Targets });
            if (targets.Failed)
            {
                problems.AddRange(targets.Failures.Where(f => f.StartsWith("Notifications:Targets:", StringComparison.Ordinal)));
            }
        }

        if (bound.GetValueOrDefault(HttpOptions.Section) is HttpOptions http)
        {
            if (http.Enabled)
            {
                ListenAddress.ParseAll(http.Urls, problems);
            }

            if (bound.GetValueOrDefault(TelemetryOptions.Section) is TelemetryOptions { PrometheusEnabled: true } && !http.Enabled)
            {
                problems.Add("Telemetry:PrometheusEnabled needs Http:Enabled: the scrape endpoint is /metrics on Http:Urls");
            }
        }

        if (bound.GetValueOrDefault(WebOptions.Section) is WebOptions web)
        {
            problems.AddRange(web.Problems((bound.GetValueOrDefault(HttpOptions.Section) as HttpOptions)?.Enabled == true));
        }

        problems.AddRange(LogLevels.Problems(configuration));
        var audited = new Dictionary<string, Type>(Sections, StringComparer.Ordinal);
        foreach ((string name, Type type) in ConnectionSettings.AuditedSections)
        {
            audited[name] = type;
        }

        IReadOnlyList<string> warnings = [.. UnknownSettings.Find(configuration, audited)
            .Where(key => !Removed.Any(r => key.StartsWith(r.Prefix, StringComparison.OrdinalIgnoreCase)))
            .Select(key => $"{key} is not a setting ModelWatch reads (known under {Section(key)}: {string.Join(", ", KnownUnder(key, audited))}); it is ignored")];
        return (problems, warnings);
    }

    private static string Section(string key) => key.Split(':')[0];

    private static IEnumerable<string> KnownUnder(string key, Dictionary<string, Type> audited)
    {
        Type type = audited[audited.Keys.First(k => k.Equals(Section(key), StringComparison.OrdinalIgnoreCase))];
        if (type.IsGenericType && type.GetGenericTypeDefinition() == typeof(Dictionary<,>))
        {
            type = type.GetGenericArguments()[1];
        }
        else if (key.Split(':') is { Length: > 2 } parts && type.GetProperty(parts[1], System.Reflection.BindingFlags.Public | System.Reflection.BindingFlags.Instance | System.Reflection.BindingFlags.IgnoreCase) is { } property
            && property.PropertyType.IsGenericType && property.PropertyType.GetGenericTypeDefinition() == typeof(Dictionary<,>))
        {
            type = property.PropertyType.GetGenericArguments()[1];
        }

        return UnknownSettings.KnownKeys(type);
    }
}
