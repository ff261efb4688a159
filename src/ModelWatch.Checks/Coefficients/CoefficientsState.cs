using ModelWatch.Checks.Sequential;

namespace ModelWatch.Checks.Coefficients;

/// <summary>The coefficients check's memory: the monitors' epoch, and the coefficient CUSUMs with the rows behind them.</summary>
public sealed record CoefficientsState
{
    /// <summary>Epochs completed since the baseline; the monitors restart at each.</summary>
    public int Epoch { get; init; }

    /// <summary>Runs in the current epoch.</summary>
    public int EpochRuns { get; init; }

    /// <summary>New rows consumed in the current epoch (monitoring time is 1 + rows/n).</summary>
    public long EpochRows { get; init; }

    /// <summary>New rows the OLS-CUSUM has summed since it (re)started: at each epoch, and after each crossing.</summary>
    public long CusumRows { get; init; }

    /// <summary>Sum of the deployed coefficients' errors over those rows (the OLS-CUSUM process before scaling).</summary>
    public double CusumErrorSum { get; init; }

    /// <summary>Factor of the reference rows plus every block the coefficient CUSUMs consumed; null until the first.</summary>
    public StoredFactor? Running { get; init; }

    /// <summary>New rows not yet enough to estimate every coefficient; they join the next run's.</summary>
    public StoredFactor? Pending { get; init; }

    /// <summary>CUSUM per coefficient (slopes).</summary>
    public Dictionary<string, CusumSums> Cusums { get; init; } = [];

    /// <summary>True from a CUSUM alarm until every sum is back at zero: new rows are kept out of the running fit meanwhile.</summary>
    public bool Quarantined { get; init; }
}
