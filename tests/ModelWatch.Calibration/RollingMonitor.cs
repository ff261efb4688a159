using ModelWatch.Checks.Evaluation;
using ModelWatch.Checks.Findings;
using ModelWatch.Checks.Policy;
using ModelWatch.Checks.Summaries;

namespace ModelWatch.Calibration;

/// <summary>
/// A model watched the way the daemon watches it: rows arrive every hour, each run reads the whole window that ends at
/// its slot (overlapping the previous one when the window is longer than the cadence), marks the rows after the
/// previous run's window as new, and runs every check and the alert policy with the states carried from run to run.
/// As in a daemon that starts right after the reference period, the first window is already full: its rows before the
/// first run are old (the reference period's tail), drawn unchanged.
/// </summary>
public sealed class RollingMonitor
{
    private readonly SyntheticModel _model;
    private readonly Cadence _cadence;
    private readonly int _rowsPerHour;
    private readonly Queue<(int Hour, double[][] X, double[] Y)> _hours = new();
    private readonly Dictionary<string, CheckState> _states = new(StringComparer.Ordinal);
    private List<AlertPolicyState> _policy = [];
    private int _hour;
    private int _lastRunHour;

    public RollingMonitor(SyntheticModel model, BaselineReference baseline, Cadence cadence, int rowsPerHour, CheckThresholds? thresholds = null)
    {
        _model = model;
        _cadence = cadence;
        _rowsPerHour = rowsPerHour;
        Baseline = baseline;
        Thresholds = (thresholds ?? new CheckThresholds()) with { Cadence = cadence.Every, WindowLength = cadence.Window };
        _hour = -(cadence.HoursPerWindow - cadence.HoursPerRun);
        while (_hour < 0)
        {
            Arrive();
        }
    }

    /// <summary>Where monitoring starts: right after the reference rows.</summary>
    public static readonly DateTimeOffset Origin = new(2026, 1, 1, 0, 0, 0, TimeSpan.Zero);

    public BaselineReference Baseline { get; }

    public CheckThresholds Thresholds { get; }

    /// <summary>Runs made.</summary>
    public int Runs { get; private set; }

    private void Arrive()
    {
        var x = new double[_rowsPerHour][];
        var y = new double[_rowsPerHour];
        for (int r = 0; r < _rowsPerHour; r++)
        {
            (x[r], y[r]) = _model.Row();
        }

        _hours.Enqueue((_hour++, x, y));
    }

    /// <summary>Rows arrive for one cadence with the model's current change, then a run reads its window.</summary>
    public (IReadOnlyList<CheckResult> Results, IReadOnlyList<AlertDecision> Decisions) Run()
    {
        for (int i = 0; i < _cadence.HoursPerRun; i++)
        {
            Arrive();
        }

        while (_hours.Count > _cadence.HoursPerWindow)
        {
            _hours.Dequeue();
        }

        var builder = new WindowSummaryBuilder(_model.Layout, Baseline, new WindowSummaryOptions { Seed = Runs + 1 });
        foreach ((int hour, double[][] x, double[] y) in _hours)
        {
            bool isNew = hour >= _lastRunHour;
            for (int r = 0; r < y.Length; r++)
            {
                builder.AddRow(x[r], y[r], null, isNew);
            }
        }

        DateTimeOffset end = Origin.AddHours(_hour);
        Runs++;
        _lastRunHour = _hour;
        IReadOnlyList<CheckResult> results = ModelChecks.Run(Baseline, builder.Build(), end - _cadence.Window, end, _states, Thresholds);
        foreach (CheckResult result in results)
        {
            _states[result.Check] = result.State;
        }

        IReadOnlyList<AlertDecision> decisions = AlertPolicy.Evaluate(results, _policy, Baseline.Fingerprint, Thresholds);
        _policy = [.. decisions.Select(d => d.State)];
        return (results, decisions);
    }
}
