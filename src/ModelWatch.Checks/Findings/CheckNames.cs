using ModelWatch.Checks.Evaluation;

namespace ModelWatch.Checks.Findings;

/// <summary>The check names, exactly as stored and reported.</summary>
public static class CheckNames
{
    /// <summary>Coefficient drift: the refit and the monitors of the coefficients against the deployed ones.</summary>
    public const string Coefficients = "coefficients";

    /// <summary>Collinearity growth: variance inflation, condition number and near-dependencies.</summary>
    public const string Collinearity = "collinearity";

    /// <summary>Residual shift: bias, spread, distribution, heteroscedasticity, autocorrelation and their CUSUMs.</summary>
    public const string Residuals = "residuals";

    /// <summary>Prediction error of the deployed coefficients and its decomposition.</summary>
    public const string Error = "error";

    /// <summary>Feature drift and extrapolation.</summary>
    public const string Features = "features";

    /// <summary>Whether the model can be watched at all: runs that keep failing, a source whose newest row is too old.</summary>
    public const string Source = "source";

    /// <summary>Data health: row counts, rejected rows, constant features, quiet sources.</summary>
    public const string Data = "data";

    /// <summary>Served predictions against the deployed coefficients.</summary>
    public const string Serving = "serving";

    /// <summary>All check names, in the order a run evaluates them (the order of <see cref="CheckRegistry.All"/>).</summary>
    public static IReadOnlyList<string> All => CheckRegistry.Names;
}
