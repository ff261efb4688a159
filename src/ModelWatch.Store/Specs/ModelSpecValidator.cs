using System.Text.Json;
using System.Text.RegularExpressions;
using ModelWatch.Checks.Evaluation;

namespace ModelWatch.Store.Specs;

/// <summary>
/// Checks a spec against the documented schema and returns either a <see cref="ModelSpec"/> or every problem
/// found, each with its file and field path. The <c>checks:</c> section is read by the checks themselves
/// (<see cref="CheckSettingsReader"/>): unknown checks, settings that are not the check's, and values that do not
/// parse or lie out of range are problems like any other.
/// </summary>
public static partial class ModelSpecValidator
{
    /// <summary>Most sub-range reads a spec may ask for.</summary>
    public const int MaxParallelReads = 16;

    /// <summary>Validates YAML text read from <paramref name="file"/>.</summary>
    public static ModelSpec? FromYaml(string file, string yaml, List<SpecProblem> problems)
    {
        ArgumentNullException.ThrowIfNull(problems);
        int before = problems.Count;
        ModelSpecDocument? doc = ModelSpecYamlReader.Read(file, yaml, problems);
        if (doc is null)
        {
            return null;
        }

        ModelSpec? spec = Validate(file, doc, problems, validateChecks: true);
        return problems.Count == before ? spec : null;
    }

    /// <summary>
    /// Reads a spec back from its stored JSON (written by <see cref="ModelSpec.ToJson"/>). Its <c>checks:</c> section is
    /// not judged again here: a setting an older version accepted still loads, and the run names it if it no longer reads.
    /// </summary>
    public static ModelSpec FromStoredJson(string json)
    {
        ModelSpecDocument doc = JsonSerializer.Deserialize<ModelSpecDocument>(json, SpecJson.Options)
            ?? throw new InvalidOperationException("A stored spec is null.");
        var problems = new List<SpecProblem>();
        return Validate("(stored spec)", doc, problems, validateChecks: false) is { } spec && problems.Count == 0
            ? spec
            : throw new ModelSpecException(problems);
    }

    private static ModelSpec? Validate(string file, ModelSpecDocument doc, List<SpecProblem> problems, bool validateChecks)
    {
        int before = problems.Count;
        var shapeProblems = problems.Where(p => p.File == file).Select(p => p.FieldPath).ToHashSet(StringComparer.Ordinal);
        void Fail(string path, string message)
        {
            // A value of the wrong shape was already reported by the YAML reader; "is required" would only repeat it.
            if (!shapeProblems.Contains(path))
            {
                problems.Add(new SpecProblem(file, path, message));
            }
        }

        if (string.IsNullOrEmpty(doc.Key))
        {
            Fail("key", "is required");
        }
        else if (!KeyPattern().IsMatch(doc.Key) || doc.Key.Length > 63)
        {
            Fail("key", $"'{doc.Key}' must be lowercase letters, digits and single '-' between them, at most 63 characters");
        }

        if (doc.Source is { } source && !SourcePattern().IsMatch(source))
        {
            Fail("source", $"'{source}' must be the name of a data source (letters, digits, '_' and '-')");
        }

        if (string.IsNullOrWhiteSpace(doc.Query))
        {
            Fail("query", "is required");
        }
        else
        {
            doc.Query = doc.Query.Trim().TrimEnd(';').TrimEnd();
            foreach (string parameter in new[] { "@window_start", "@window_end" })
            {
                if (!SqlCode.Uses(doc.Query, parameter))
                {
                    // A parameter only in a comment or a string constant binds nothing: the query would read everything.
                    Fail("query", Regex.IsMatch(doc.Query, Regex.Escape(parameter) + @"(?![A-Za-z0-9_])")
                        ? $"uses {parameter} only inside a comment, a string or a quoted identifier, where it filters nothing; use it in the statement (the window is [@window_start, @window_end), timestamptz)"
                        : $"must use the parameter {parameter} (the window is [@window_start, @window_end), timestamptz)");
                }
            }

            if (SqlCode.Of(doc.Query).Contains(';', StringComparison.Ordinal))
            {
                Fail("query", "must be a single SQL statement (no ';' inside)");
            }
        }

        Column("time_column", doc.TimeColumn, required: true);
        Column("outcome", doc.Outcome, required: true);
        Column("prediction_column", doc.PredictionColumn, required: false);
        if (doc.Features is null || doc.Features.Count == 0)
        {
            Fail("features", "is required: a list of at least one feature column");
        }
        else
        {
            var seen = new HashSet<string>(StringComparer.Ordinal);
            for (int i = 0; i < doc.Features.Count; i++)
            {
                string feature = doc.Features[i];
                string path = $"features[{i}]";
                if (!Column(path, feature, required: true))
                {
                    continue;
                }

                if (!seen.Add(feature))
                {
                    Fail(path, $"'{feature}' is listed twice");
                }
                else if (feature == doc.Outcome)
                {
                    Fail(path, $"'{feature}' is the outcome; a column cannot be both");
                }
                else if (feature == doc.TimeColumn)
                {
                    Fail(path, $"'{feature}' is the time_column; a column cannot be both");
                }
            }
        }

        if (doc.Outcome is not null && doc.Outcome == doc.TimeColumn)
        {
            Fail("outcome", $"'{doc.Outcome}' is the time_column; a column cannot be both");
        }

        if (doc.OutcomeUnit is { } unit && (unit.Trim().Length == 0 || unit.Length > 32 || unit.Any(char.IsControl)))
        {
            Fail("outcome.unit", "must be 1 to 32 printable characters, e.g. 'minutes' or 'EUR'");
        }

        if (doc.PredictionColumn is not null && (doc.PredictionColumn == doc.Outcome || doc.Features?.Contains(doc.PredictionColumn) == true))
        {
            Fail("prediction_column", $"'{doc.PredictionColumn}' is already the outcome or a feature");
        }

        doc.Intercept ??= true;
        int parameters = (doc.Features?.Count ?? 0) + (doc.Intercept.Value ? 1 : 0);

        Schedule? schedule = null;
        if (doc.Schedule is null)
        {
            Fail("schedule", "is required: an interval such as 1h, or a five-field cron expression such as '0 6 * * *'");
        }
        else if (!Schedule.TryParse(doc.Schedule, out schedule, out string error))
        {
            Fail("schedule", error);
        }

        Duration window = default;
        if (doc.Window is null)
        {
            Fail("window", "is required: a positive duration such as 24h or 7d");
        }
        else if (!Duration.TryParse(doc.Window, out window, out _) || window.Amount == 0)
        {
            Fail("window", $"must be a positive duration such as 24h or 7d, not '{doc.Window}'");
        }

        doc.LabelDelay ??= "0s";
        if (!Duration.TryParse(doc.LabelDelay, out Duration labelDelay, out _))
        {
            Fail("label_delay", $"must be a duration of zero or more such as 0s, 6h or 2d, not '{doc.LabelDelay}'");
        }

        doc.MinRows ??= Math.Max(30, 10 * parameters);
        if (doc.MinRows <= parameters + 1)
        {
            Fail("min_rows", $"must be more than {parameters + 1} (the {parameters} parameter(s) plus one, so the residual variance can be estimated), not {doc.MinRows}");
        }

        doc.Missing ??= "skip-row";
        MissingValuePolicy missing = doc.Missing switch
        {
            "skip-row" => MissingValuePolicy.SkipRow,
            "fail" => MissingValuePolicy.Fail,
            _ => MissingValuePolicy.Fail,
        };
        if (doc.Missing is not ("skip-row" or "fail"))
        {
            Fail("missing", $"must be skip-row or fail, not '{doc.Missing}'");
        }

        doc.Checks ??= new Dictionary<string, Dictionary<string, string>>(StringComparer.Ordinal);
        foreach ((string check, Dictionary<string, string> settings) in doc.Checks)
        {
            if (validateChecks)
            {
                foreach (string message in CheckSettingsReader.Problems(check, settings))
                {
                    Fail($"checks.{check}", message);
                }
            }
        }

        doc.Notify ??= [];
        for (int i = 0; i < doc.Notify.Count; i++)
        {
            if (!SourcePattern().IsMatch(doc.Notify[i]))
            {
                Fail($"notify[{i}]", $"'{doc.Notify[i]}' must be the name of a notification target (letters, digits, '_' and '-')");
            }
        }

        doc.Enabled ??= true;
        doc.ParallelReads ??= 1;
        if (doc.ParallelReads is < 1 or > MaxParallelReads)
        {
            Fail("parallel_reads", $"must be between 1 and {MaxParallelReads}, not {doc.ParallelReads}");
        }

        return problems.Count == before && shapeProblems.Count == 0
            ? new ModelSpec(doc, schedule!, window, labelDelay, missing)
            : null;

        bool Column(string path, string? name, bool required)
        {
            if (string.IsNullOrEmpty(name))
            {
                if (required)
                {
                    Fail(path, "is required: a column name of the query's result");
                }

                return false;
            }

            if (name.Length > 63 || name.Any(char.IsControl) || name.Trim() != name)
            {
                Fail(path, $"'{name}' is not a usable column name (at most 63 characters, no control characters or surrounding spaces)");
                return false;
            }

            return true;
        }
    }

    [GeneratedRegex("^[a-z0-9]+(-[a-z0-9]+)*$")]
    private static partial Regex KeyPattern();

    [GeneratedRegex("^[A-Za-z0-9_-]+$")]
    private static partial Regex SourcePattern();
}
