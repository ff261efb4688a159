namespace ModelWatch.Checks.Findings;

/// <summary>The check names, exactly as stored and reported.</summary>
public static class CheckNames
{
    /// <summary>Coefficient drift (methods.md §2).</summary>
    public const string Coefficients = "coefficients";

    /// <summary>Collinearity growth (methods.md §4).</summary>
    public const string Collinearity = "collinearity";

    /// <summary>Residual shift (methods.md §5) and the sequential CUSUM (§3.2).</summary>
    public const string Residuals = "residuals";

    /// <summary>Prediction error of the deployed coefficients and its decomposition (methods.md §6).</summary>
    public const string Error = "error";

    /// <summary>Feature drift and extrapolation (methods.md §7).</summary>
    public const string Features = "features";

    /// <summary>Data health: row counts, rejected rows, constant features, quiet sources.</summary>
    public const string Data = "data";

    /// <summary>Served predictions against the deployed coefficients.</summary>
    public const string Serving = "serving";

    /// <summary>All check names, in the order a run evaluates them.</summary>
    public static readonly IReadOnlyList<string> All = [Data, Serving, Coefficients, Collinearity, Residuals, Error, Features];
}
