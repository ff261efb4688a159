using System.Globalization;
using System.Text.Json;
using ModelWatch.Checks.Summaries;
using ModelWatch.Numerics.Regression;

namespace ModelWatch.Store.Baselines;

/// <summary>
/// Reads deployed coefficients from JSON in either of two shapes (docs/model-spec.md, "Baseline import"):
/// the output of <c>modelwatch fit --format json</c> (<c>coefficients</c> is a list of <c>{term, estimate, std_error}</c>),
/// or our import format (<c>coefficients</c> is an object from term to value, with optional <c>covariance</c> in term
/// order, <c>standard_errors</c>, <c>n</c>, <c>residual_sd</c>, <c>residual_df</c>). Terms must match the spec's exactly.
/// Everything stored is checked first, and every problem is listed at once with its path: a key given twice, a field
/// neither shape has, a covariance that is not symmetric positive definite or disagrees with the standard errors, a
/// standard error that is not positive, a residual df other than n − p, a scale that is not a positive finite number.
/// A baseline that passes these can be trusted by the tests; one that does not is never half-used.
/// </summary>
public static class BaselineImportFile
{
    private static readonly string[] ImportFields = ["coefficients", "covariance", "standard_errors", "n", "residual_sd", "residual_df", "intercept"];
    private static readonly string[] FitFields = ["n", "p", "rank", "intercept", "coefficients", "rss", "residual_sd", "r_squared", "adj_r_squared", "f_statistic", "f_p_value", "condition_number", "vif"];
    private static readonly string[] FitTermFields = ["term", "estimate", "std_error", "t", "p_value"];

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

            Duplicates(root, string.Empty, problems);
            UnknownFields(root, coefficientsElement.ValueKind == JsonValueKind.Array, problems);

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
                    standardErrors = new Dictionary<string, double>(StringComparer.Ordinal);
                    foreach (JsonProperty property in ses.EnumerateObject())
                    {
                        if (property.Value.ValueKind == JsonValueKind.Number)
                        {
                            standardErrors[property.Name] = property.Value.GetDouble();
                        }
                        else
                        {
                            problems.Add($"standard_errors.{property.Name}: must be a positive finite number");
                        }

                        if (!layout.Terms.Contains(property.Name))
                        {
                            problems.Add($"standard_errors.{property.Name}: not a term of the spec");
                        }
                    }
                }
                else if (root.TryGetProperty("standard_errors", out JsonElement notObject) && notObject.ValueKind != JsonValueKind.Null)
                {
                    problems.Add("standard_errors: must be an object from term to standard error");
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

            foreach ((string term, double se) in standardErrors ?? [])
            {
                if (!double.IsFinite(se) || !(se > 0))
                {
                    problems.Add($"standard_errors.{term}: {se.ToString("R", CultureInfo.InvariantCulture)} is not a positive finite number");
                }
            }

            double[][]? covariance = Covariance(root, layout, problems);
            if (covariance is not null && standardErrors is { Count: > 0 })
            {
                for (int i = 0; i < layout.Terms.Count; i++)
                {
                    if (standardErrors.TryGetValue(layout.Terms[i], out double se) && se > 0 && covariance[i][i] > 0
                        && Math.Abs(Math.Sqrt(covariance[i][i]) - se) > 1e-6 * se)
                    {
                        problems.Add(string.Create(CultureInfo.InvariantCulture,
                            $"standard_errors.{layout.Terms[i]}: {se:G6} disagrees with the covariance, whose diagonal gives {Math.Sqrt(covariance[i][i]):G6}"));
                    }
                }
            }

            long? n = WholeNumber(root, "n", problems);
            long? residualDf = WholeNumber(root, "residual_df", problems);
            double? residualSd = Number(root, "residual_sd");
            if (residualSd is { } s && (!double.IsFinite(s) || !(s > 0)))
            {
                problems.Add("residual_sd: must be a positive finite number");
            }

            int p = layout.ParameterCount;
            if (n is { } rows && rows <= p)
            {
                problems.Add($"n: {rows} training rows cannot fit {p} coefficients (n must be above p)");
            }

            if (residualDf is { } dfValue && (dfValue <= 0 || (n is { } count && dfValue != count - p)))
            {
                problems.Add(n is { } count2
                    ? $"residual_df: {dfValue} is not n − p = {count2} − {p} = {count2 - p}"
                    : $"residual_df: {dfValue} must be a positive whole number");
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
                ResidualDegreesOfFreedom = residualDf ?? (n is { } trainingRows ? trainingRows - layout.ParameterCount : null),
            };
        }
    }

    private static double[][]? Covariance(JsonElement root, DesignLayout layout, List<string> problems)
    {
        int p = layout.ParameterCount;
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

        double[][] c = [.. element.EnumerateArray().Select(r => r.EnumerateArray().Select(v => v.GetDouble()).ToArray())];
        int before = problems.Count;
        for (int i = 0; i < p; i++)
        {
            for (int j = 0; j < p; j++)
            {
                if (!double.IsFinite(c[i][j]))
                {
                    problems.Add($"covariance[{i}][{j}]: must be a finite number");
                }
                else if (j > i && Math.Abs(c[i][j] - c[j][i]) > 1e-9 * Math.Sqrt(Math.Abs(c[i][i] * c[j][j])))
                {
                    problems.Add(string.Create(CultureInfo.InvariantCulture,
                        $"covariance[{i}][{j}]: {c[i][j]:G6} differs from covariance[{j}][{i}] {c[j][i]:G6}; a covariance is symmetric ({layout.Terms[i]}, {layout.Terms[j]})"));
                }
            }
        }

        if (problems.Count == before && CholeskyFailsAt(c) is { } term)
        {
            problems.Add($"covariance: not positive definite (the Cholesky factorisation fails at term '{layout.Terms[term]}', the {term + 1}. of {p}): no variance can be negative or a coefficient an exact combination of the others");
        }

        return problems.Count == before ? c : null;
    }

    /// <summary>The first pivot at which the Cholesky factorisation of a symmetric matrix fails, or null when it succeeds.</summary>
    private static int? CholeskyFailsAt(double[][] c)
    {
        int p = c.Length;
        var l = new double[p, p];
        for (int j = 0; j < p; j++)
        {
            double d = c[j][j];
            for (int k = 0; k < j; k++)
            {
                d -= l[j, k] * l[j, k];
            }

            // A pivot that is not clearly positive relative to the diagonal is a singular (or indefinite) matrix in floating point.
            if (!(d > 1e-14 * Math.Abs(c[j][j])) || !double.IsFinite(d))
            {
                return j;
            }

            l[j, j] = Math.Sqrt(d);
            for (int i = j + 1; i < p; i++)
            {
                double v = c[i][j];
                for (int k = 0; k < j; k++)
                {
                    v -= l[i, k] * l[j, k];
                }

                l[i, j] = v / l[j, j];
            }
        }

        return null;
    }

    private static long? WholeNumber(JsonElement root, string name, List<string> problems)
    {
        if (!root.TryGetProperty(name, out JsonElement value) || value.ValueKind == JsonValueKind.Null)
        {
            return null;
        }

        if (value.ValueKind == JsonValueKind.Number && value.TryGetInt64(out long whole) && whole > 0)
        {
            return whole;
        }

        problems.Add($"{name}: must be a positive whole number");
        return null;
    }

    private static void Duplicates(JsonElement element, string path, List<string> problems)
    {
        if (element.ValueKind == JsonValueKind.Object)
        {
            var seen = new HashSet<string>(StringComparer.Ordinal);
            foreach (JsonProperty property in element.EnumerateObject())
            {
                string at = path.Length == 0 ? property.Name : path + "." + property.Name;
                if (!seen.Add(property.Name))
                {
                    problems.Add($"{at}: the key appears more than once (which one is meant cannot be told)");
                }

                Duplicates(property.Value, at, problems);
            }
        }
        else if (element.ValueKind == JsonValueKind.Array)
        {
            int i = 0;
            foreach (JsonElement item in element.EnumerateArray())
            {
                Duplicates(item, $"{path}[{i++}]", problems);
            }
        }
    }

    private static void UnknownFields(JsonElement root, bool fitOutput, List<string> problems)
    {
        string[] known = fitOutput ? FitFields : ImportFields;
        foreach (JsonProperty property in root.EnumerateObject().Where(p => !known.Contains(p.Name)))
        {
            problems.Add($"{property.Name}: not a field of {(fitOutput ? "the output of 'modelwatch fit --format json'" : "the import format")} (fields: {string.Join(", ", known)})");
        }

        if (fitOutput && root.TryGetProperty("coefficients", out JsonElement list))
        {
            int i = 0;
            foreach (JsonElement item in list.EnumerateArray())
            {
                if (item.ValueKind == JsonValueKind.Object)
                {
                    foreach (JsonProperty property in item.EnumerateObject().Where(p => !FitTermFields.Contains(p.Name)))
                    {
                        problems.Add($"coefficients[{i}].{property.Name}: not a field of a term (fields: {string.Join(", ", FitTermFields)})");
                    }
                }

                i++;
            }
        }
    }

    private static double? Number(JsonElement element, string name) =>
        element.TryGetProperty(name, out JsonElement value) && value.ValueKind == JsonValueKind.Number ? value.GetDouble() : null;
}
