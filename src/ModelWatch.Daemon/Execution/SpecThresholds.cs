using System.Globalization;
using System.Reflection;
using System.Text.Json;
using ModelWatch.Checks.Policy;
using ModelWatch.Store.Specs;

namespace ModelWatch.Daemon.Execution;

/// <summary>
/// Builds a model's <see cref="CheckThresholds"/> from its spec: the cadence and window length from the schedule and
/// window, then every override under <c>checks:</c>, matched by snake_case name to a threshold
/// (<c>checks: { coefficients: { drift_impact_floor: 0.2 } }</c> sets <c>DriftImpactFloor</c>). Thresholds are one
/// family per model, so the check a setting is written under only groups it for the reader.
/// </summary>
public static class SpecThresholds
{
    private static readonly Dictionary<string, PropertyInfo> Settable = typeof(CheckThresholds)
        .GetProperties(BindingFlags.Public | BindingFlags.Instance)
        .Where(p => p.SetMethod is not null)
        .ToDictionary(p => JsonNamingPolicy.SnakeCaseLower.ConvertName(p.Name), StringComparer.Ordinal);

    /// <summary>Names accepted under <c>checks:</c>.</summary>
    public static IReadOnlyCollection<string> Names => Settable.Keys;

    /// <summary>Returns the thresholds, or throws <see cref="ArgumentException"/> naming a setting that does not exist or does not parse.</summary>
    public static CheckThresholds For(ModelSpec spec, DateTimeOffset now)
    {
        ArgumentNullException.ThrowIfNull(spec);
        var thresholds = new CheckThresholds
        {
            Cadence = Cadence(spec.Schedule, now),
            WindowLength = spec.Window.Length,
            MinimumRows = spec.MinRows,
        };
        object boxed = thresholds;
        foreach ((string check, IReadOnlyDictionary<string, string> settings) in spec.Checks)
        {
            foreach ((string name, string text) in settings)
            {
                if (!Settable.TryGetValue(name, out PropertyInfo? property))
                {
                    throw new ArgumentException($"model {spec.Key}: checks.{check}.{name}: unknown setting (known: {string.Join(", ", Settable.Keys.Order(StringComparer.Ordinal))})");
                }

                property.SetValue(boxed, Parse(spec.Key, check, name, text, property.PropertyType));
            }
        }

        return (CheckThresholds)boxed;
    }

    /// <summary>Time between slots: the interval, or for cron the gap between the next two occurrences.</summary>
    public static TimeSpan Cadence(Schedule schedule, DateTimeOffset now)
    {
        ArgumentNullException.ThrowIfNull(schedule);
        if (schedule.Interval is { } interval)
        {
            return interval.Length;
        }

        DateTimeOffset? first = schedule.NextSlotAfter(now);
        DateTimeOffset? second = first is { } f ? schedule.NextSlotAfter(f) : null;
        return first is { } a && second is { } b ? b - a : TimeSpan.FromDays(1);
    }

    private static object? Parse(string model, string check, string name, string text, Type type)
    {
        Type target = Nullable.GetUnderlyingType(type) ?? type;
        bool ok;
        object? value;
        if (target == typeof(double))
        {
            ok = double.TryParse(text, NumberStyles.Float, CultureInfo.InvariantCulture, out double d) && double.IsFinite(d);
            value = d;
        }
        else if (target == typeof(int))
        {
            ok = int.TryParse(text, NumberStyles.Integer, CultureInfo.InvariantCulture, out int i);
            value = i;
        }
        else if (target == typeof(bool))
        {
            ok = bool.TryParse(text, out bool b);
            value = b;
        }
        else if (target == typeof(TimeSpan))
        {
            ok = Duration.TryParse(text, out Duration duration, out _);
            value = duration.Length;
        }
        else
        {
            ok = false;
            value = null;
        }

        return ok ? value : throw new ArgumentException($"model {model}: checks.{check}.{name}: '{text}' is not a valid {target.Name.ToLowerInvariant()}");
    }
}
