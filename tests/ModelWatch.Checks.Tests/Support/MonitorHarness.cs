using ModelWatch.Checks.Evaluation;
using ModelWatch.Checks.Findings;
using ModelWatch.Checks.Policy;
using ModelWatch.Checks.Summaries;

namespace ModelWatch.Checks.Tests.Support;

/// <summary>
/// Replays windows through the complete pure pipeline — window summary, every check, the alert policy — carrying
/// the persisted states between runs exactly as the daemon would.
/// </summary>
internal sealed class MonitorHarness
{
    private static readonly DateTimeOffset Origin = new(2026, 1, 1, 0, 0, 0, TimeSpan.Zero);
    private readonly Dictionary<string, CheckState> _states = new(StringComparer.Ordinal);
    private readonly Queue<List<(double[] X, double Y)>> _batches = new();
    private List<AlertPolicyState> _policy = [];
    private int _run;

    public MonitorHarness(BaselineReference baseline, CheckThresholds thresholds)
    {
        Baseline = baseline;
        Thresholds = thresholds;
    }

    public BaselineReference Baseline { get; }

    public CheckThresholds Thresholds { get; }

    /// <summary>Runs one non-overlapping window of <paramref name="rows"/> rows; returns the checks' results and the policy's decisions.</summary>
    public (IReadOnlyList<CheckResult> Results, IReadOnlyList<AlertDecision> Decisions) Step(SyntheticModel model, int rows)
    {
        var builder = new WindowSummaryBuilder(model.Layout, Baseline, new WindowSummaryOptions { Seed = _run + 1 });
        for (int i = 0; i < rows; i++)
        {
            (double[] x, double y) = model.Row();
            builder.AddRow(x, y);
        }

        DateTimeOffset start = Origin + (Thresholds.WindowLength * _run);
        _run++;
        return Evaluate(builder.Build(), start, start + Thresholds.WindowLength);
    }

    /// <summary>
    /// Runs one scheduled run of an overlapping window: <paramref name="newRows"/> rows arrive each cadence and the
    /// window holds the last WindowLength/Cadence batches, only the newest marked new since the previous run.
    /// </summary>
    public (IReadOnlyList<CheckResult> Results, IReadOnlyList<AlertDecision> Decisions) StepRolling(SyntheticModel model, int newRows)
    {
        int batchesPerWindow = (int)(Thresholds.WindowLength / Thresholds.Cadence);
        _batches.Enqueue(Enumerable.Range(0, newRows).Select(_ => model.Row()).ToList());
        while (_batches.Count > batchesPerWindow)
        {
            _batches.Dequeue();
        }

        var builder = new WindowSummaryBuilder(model.Layout, Baseline, new WindowSummaryOptions { Seed = _run + 1 });
        int index = 0;
        foreach (List<(double[] X, double Y)> batch in _batches)
        {
            bool isNew = ++index == _batches.Count;
            foreach ((double[] x, double y) in batch)
            {
                builder.AddRow(x, y, null, isNew);
            }
        }

        _run++;
        DateTimeOffset end = Origin + (Thresholds.Cadence * _run);
        return Evaluate(builder.Build(), end - (Thresholds.Cadence * _batches.Count), end);
    }

    private (IReadOnlyList<CheckResult> Results, IReadOnlyList<AlertDecision> Decisions) Evaluate(WindowSummary window, DateTimeOffset start, DateTimeOffset end)
    {
        IReadOnlyList<CheckResult> results = ModelChecks.Run(Baseline, window, start, end, _states, Thresholds);
        foreach (CheckResult r in results)
        {
            _states[r.Check] = r.State;
        }

        IReadOnlyList<AlertDecision> decisions = AlertPolicy.Evaluate(results, _policy, Baseline.Fingerprint, Thresholds);
        _policy = decisions.Select(d => d.State).ToList();
        return (results, decisions);
    }
}
