using System.Text.Json;
using ModelWatch.Checks.Summaries;
using ModelWatch.Numerics.Regression;

namespace ModelWatch.Store.Baselines;

/// <summary>
/// Reads deployed coefficients from JSON in either of two shapes (docs/model-spec.md, "Baseline import"):
/// the output of <c>modelwatch fit --format json</c> (<c>coefficients</c> is a list of <c>{term, estimate, std_error}</c>),
/// or our import format (<c>coefficients</c> is an object from term to value, with optional <c>covariance</c> in term
/// order, <c>standard_errors</c>, <c>n</c>, <c>residual_sd</c>, <c>residual_df</c>). Terms must match the spec's exactly.
/// </summary>
public static class BaselineImportFile
{
    /// <summary>Parses <paramref name="json"/> for <paramref name="layout"/>; every problem is reported at once.</summary>
    public static ImportedCoefficients Parse(string file, string json, DesignLayout layout)
    {
        ArgumentNullException.ThrowIfNull(layout);
        JsonDocument document;
        try
        {
            document = JsonDocument.Parse(json, new JsonDocumentOptions { AllowTrailingCommas = true, CommentHandling = JsonCommentHandling.Skip });
        }
        catch (JsonException ex)
        {
            throw new BaselineException($"{file}: not valid JSON: {ex.Message}", ex);
        }

        using (document)
        {
            var problems = new List<string>();
            JsonElement root = document.RootElement;
            if (root.ValueKind != JsonValueKind.Object || !root.TryGetProperty("coefficients", out JsonElement coefficientsElement))
            {
                throw new BaselineException($"{file}: expected a JSON object with 'coefficients' (see docs/model-spec.md, \"Baseline import\")");
            }

            var coefficients = new Dictionary<string, double>(StringComparer.Ordinal);
            Dictionary<string, double>? standardErrors = null;
            if (coefficientsElement.ValueKind == JsonValueKind.Array)
            {
                // The fit command's output: [{ "term", "estimate", "std_error", ... }].
                standardErrors = new Dictionary<string, double>(StringComparer.Ordinal);
                foreach (JsonElement item in coefficientsElement.EnumerateArray())
                {
                    string term = item.TryGetProperty("term", out JsonElement t) && t.ValueKind == JsonValueKind.String ? t.GetString()! : "?";
                    if (Number(item, "estimate") is { } estimate)
                    {
                        coefficients[term] = estimate;
                    }
                    else
                    {
                        problems.Add($"coefficients: term '{term}' has no estimate (an aliased term cannot be deployed)");
                    }

                    if (Number(item, "std_error") is { } se)
                    {
                        standardErrors[term] = se;
                    }
                }

                if (root.TryGetProperty("intercept", out JsonElement intercept) && intercept.ValueKind is JsonValueKind.True or JsonValueKind.False
                    && intercept.GetBoolean() != layout.Intercept)
                {
                    problems.Add($"intercept: the file says {intercept.GetBoolean().ToString().ToLowerInvariant()}, the spec says {layout.Intercept.ToString().ToLowerInvariant()}");
                }
            }
            else if (coefficientsElement.ValueKind == JsonValueKind.Object)
            {
                foreach (JsonProperty property in coefficientsElement.EnumerateObject())
                {
                    if (property.Value.ValueKind == JsonValueKind.Number && double.IsFinite(property.Value.GetDouble()))
                    {
                        coefficients[property.Name] = property.Value.GetDouble();
                    }
                    else
                    {
                        problems.Add($"coefficients.{property.Name}: must be a finite number");
                    }
                }

                if (root.TryGetProperty("standard_errors", out JsonElement ses) && ses.ValueKind == JsonValueKind.Object)
                {
                    standardErrors = ses.EnumerateObject().Where(p => p.Value.ValueKind == JsonValueKind.Number)
                        .ToDictionary(p => p.Name, p => p.Value.GetDouble(), StringComparer.Ordinal);
                }
            }
            else
            {
                problems.Add("coefficients: must be an object from term to value, or the list that 'modelwatch fit --format json' prints");
            }

            foreach (string term in layout.Terms.Where(t => !coefficients.ContainsKey(t)))
            {
                problems.Add($"coefficients: term '{term}' of the spec is missing");
            }

            foreach (string term in coefficients.Keys.Where(t => !layout.Terms.Contains(t)))
            {
                problems.Add($"coefficients: term '{term}' is not in the spec (its terms are {string.Join(", ", layout.Terms)})");
            }

            double[][]? covariance = Covariance(root, layout.ParameterCount, problems);
            long? n = Number(root, "n") is { } nValue ? (long)nValue : null;
            double? residualSd = Number(root, "residual_sd");
            long? residualDf = Number(root, "residual_df") is { } df ? (long)df : null;
            if (residualSd is { } s && !(s > 0))
            {
                problems.Add("residual_sd: must be positive");
            }

            if (problems.Count > 0)
            {
                throw new BaselineException($"{file}: " + string.Join($"{Environment.NewLine}{file}: ", problems));
            }

            return new ImportedCoefficients
            {
                Coefficients = coefficients,
                Covariance = covariance,
                StandardErrors = standardErrors is { Count: > 0 } ? standardErrors : null,
                RowCount = n,
                ResidualStandardDeviation = residualSd,
                ResidualDegreesOfFreedom = residualDf ?? (n is { } rows ? rows - layout.ParameterCount : null),
            };
        }
    }

    private static double[][]? Covariance(JsonElement root, int p, List<string> problems)
    {
        if (!root.TryGetProperty("covariance", out JsonElement element) || element.ValueKind == JsonValueKind.Null)
        {
            return null;
        }

        if (element.ValueKind != JsonValueKind.Array || element.GetArrayLength() != p
            || element.EnumerateArray().Any(r => r.ValueKind != JsonValueKind.Array || r.GetArrayLength() != p || r.EnumerateArray().Any(v => v.ValueKind != JsonValueKind.Number)))
        {
            problems.Add($"covariance: must be a {p}×{p} array of numbers in the spec's term order");
            return null;
        }

        return [.. element.EnumerateArray().Select(r => r.EnumerateArray().Select(v => v.GetDouble()).ToArray())];
    }

    private static double? Number(JsonElement element, string name) =>
        element.TryGetProperty(name, out JsonElement value) && value.ValueKind == JsonValueKind.Number ? value.GetDouble() : null;
}
