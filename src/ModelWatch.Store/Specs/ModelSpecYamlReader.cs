using System.Globalization;
using YamlDotNet.Core;
using YamlDotNet.RepresentationModel;

namespace ModelWatch.Store.Specs;

/// <summary>
/// Reads one YAML model spec into a <see cref="ModelSpecDocument"/>, walking the node tree by hand so that
/// every unknown field and every value of the wrong shape is reported with its field path, not just the first.
/// </summary>
internal static class ModelSpecYamlReader
{
    public static ModelSpecDocument? Read(string file, string text, List<SpecProblem> problems)
    {
        var stream = new YamlStream();
        try
        {
            stream.Load(new StringReader(text));
        }
        catch (YamlException ex)
        {
            problems.Add(new SpecProblem(file, string.Empty, $"not valid YAML at line {ex.Start.Line}, column {ex.Start.Column}: {ex.InnerException?.Message ?? ex.Message}"));
            return null;
        }

        if (stream.Documents.Count != 1 || stream.Documents[0].RootNode is not YamlMappingNode root)
        {
            problems.Add(new SpecProblem(file, string.Empty, "a model spec is one YAML document whose top level is a mapping of fields (key: value)"));
            return null;
        }

        var doc = new ModelSpecDocument();
        foreach ((YamlNode keyNode, YamlNode value) in root.Children)
        {
            string field = (keyNode as YamlScalarNode)?.Value ?? string.Empty;
            var context = new Context(file, field, problems);
            switch (field)
            {
                case "key": doc.Key = context.String(value); break;
                case "description": doc.Description = context.String(value); break;
                case "source": doc.Source = context.String(value); break;
                case "query": doc.Query = context.String(value); break;
                case "time_column": doc.TimeColumn = context.String(value); break;
                case "outcome": (doc.Outcome, doc.OutcomeUnit) = context.Outcome(value); break;
                case "features": doc.Features = context.StringList(value); break;
                case "intercept": doc.Intercept = context.Boolean(value); break;
                case "schedule": doc.Schedule = context.String(value); break;
                case "window": doc.Window = context.String(value); break;
                case "min_rows": doc.MinRows = context.Integer(value); break;
                case "missing": doc.Missing = context.String(value); break;
                case "checks": doc.Checks = context.Checks(value); break;
                case "notify": doc.Notify = context.StringList(value); break;
                case "label_delay": doc.LabelDelay = context.String(value); break;
                case "prediction_column": doc.PredictionColumn = context.String(value); break;
                case "enabled": doc.Enabled = context.Boolean(value); break;
                case "parallel_reads": doc.ParallelReads = context.Integer(value); break;
                default:
                    problems.Add(new SpecProblem(file, field, $"unknown field; a spec may have {string.Join(", ", ModelSpecDocument.FieldNames)}"));
                    break;
            }
        }

        return doc;
    }

    private static bool IsNull(YamlNode node) =>
        node is YamlScalarNode { Style: YamlDotNet.Core.ScalarStyle.Plain, Value: null or "" or "~" or "null" or "Null" or "NULL" };

    private readonly record struct Context(string File, string Path, List<SpecProblem> Problems)
    {
        public string? String(YamlNode node)
        {
            if (IsNull(node))
            {
                return null;
            }

            if (node is YamlScalarNode scalar)
            {
                return scalar.Value;
            }

            Fail("must be a single value (a string), not a list or mapping");
            return null;
        }

        /// <summary>The outcome: a column name, or a mapping <c>{column: NAME, unit: TEXT}</c> that also names its unit.</summary>
        public (string? Column, string? Unit) Outcome(YamlNode node)
        {
            if (node is not YamlMappingNode mapping)
            {
                return (String(node), null);
            }

            string? column = null, unit = null;
            foreach ((YamlNode keyNode, YamlNode value) in mapping.Children)
            {
                string name = (keyNode as YamlScalarNode)?.Value ?? string.Empty;
                var part = this with { Path = Path + "." + name };
                switch (name)
                {
                    case "column": column = part.String(value); break;
                    case "unit": unit = part.String(value); break;
                    default: part.Fail("unknown field; an outcome mapping has column and unit"); break;
                }
            }

            // A mapping without column is reported once, by the validator, as a missing outcome.
            return (column, unit);
        }

        public bool? Boolean(YamlNode node)
        {
            string? text = String(node);
            switch (text)
            {
                case null: return null;
                case "true" or "True" or "TRUE": return true;
                case "false" or "False" or "FALSE": return false;
                default:
                    Fail($"must be true or false, not '{text}'");
                    return null;
            }
        }

        public int? Integer(YamlNode node)
        {
            string? text = String(node);
            if (text is null)
            {
                return null;
            }

            if (int.TryParse(text, NumberStyles.AllowLeadingSign, CultureInfo.InvariantCulture, out int value))
            {
                return value;
            }

            Fail($"must be a whole number, not '{text}'");
            return null;
        }

        public List<string>? StringList(YamlNode node)
        {
            if (IsNull(node))
            {
                return null;
            }

            if (node is not YamlSequenceNode sequence)
            {
                Fail("must be a list (one '- item' per line, or [a, b])");
                return null;
            }

            var items = new List<string>();
            for (int i = 0; i < sequence.Children.Count; i++)
            {
                var item = this with { Path = $"{Path}[{i}]" };
                if (item.String(sequence.Children[i]) is { } text)
                {
                    items.Add(text);
                }
                else if (IsNull(sequence.Children[i]))
                {
                    item.Fail("must not be empty");
                }
            }

            return items;
        }

        public Dictionary<string, Dictionary<string, string>>? Checks(YamlNode node)
        {
            if (IsNull(node))
            {
                return null;
            }

            if (node is not YamlMappingNode mapping)
            {
                Fail("must be a mapping from check name to its settings");
                return null;
            }

            var checks = new Dictionary<string, Dictionary<string, string>>(StringComparer.Ordinal);
            foreach ((YamlNode nameNode, YamlNode settingsNode) in mapping.Children)
            {
                string name = (nameNode as YamlScalarNode)?.Value ?? string.Empty;
                var check = this with { Path = $"{Path}.{name}" };
                if (settingsNode is not YamlMappingNode settingsMapping)
                {
                    check.Fail("must be a mapping of setting names to values");
                    continue;
                }

                var settings = new Dictionary<string, string>(StringComparer.Ordinal);
                foreach ((YamlNode settingName, YamlNode settingValue) in settingsMapping.Children)
                {
                    string setting = (settingName as YamlScalarNode)?.Value ?? string.Empty;
                    if ((check with { Path = $"{check.Path}.{setting}" }).String(settingValue) is { } text)
                    {
                        settings[setting] = text;
                    }
                }

                checks[name] = settings;
            }

            return checks;
        }

        public void Fail(string message) => Problems.Add(new SpecProblem(File, Path, message));
    }
}
