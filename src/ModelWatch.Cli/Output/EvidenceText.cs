using System.Globalization;
using ModelWatch.Checks.Findings;
using ModelWatch.Daemon.Evidence;

namespace ModelWatch.Cli.Output;

/// <summary>The terminal form of the evidence: what moved, the error decomposition, the features involved, the runbook.</summary>
internal static class EvidenceText
{
    public static void Write(TextWriter output, Evidence evidence)
    {
        if (evidence.Alert is { } alert)
        {
            output.WriteLine($"alert {alert.Id}: model {alert.Model}, check {alert.Check}, subject {alert.Subject ?? "model"}, {alert.Severity}, {alert.State}");
            output.WriteLine($"  opened {CliJson.Time(alert.OpenedAt)}" + (alert.ResolvedAt is { } r ? $", resolved {CliJson.Time(r)}" : string.Empty));
            if (evidence.PreviousAlertId is { } previous)
            {
                output.WriteLine($"  again, after #{previous.ToString(CultureInfo.InvariantCulture)}");
            }

            if (alert.Explanation is { } latest)
            {
                output.WriteLine($"  latest evidence: {TerminalText.Clean(latest)}");
            }
        }
        else
        {
            output.WriteLine($"run {evidence.Id}: model {evidence.Model}");
        }

        EvidenceRun? focus = evidence.Focus;
        if (focus is null)
        {
            output.WriteLine("  the run behind this evidence has been pruned from the history; only the alert record remains");
            WriteRunbook(output, evidence.Alert is { } a ? [a.Check] : []);
            return;
        }

        output.WriteLine($"  run {focus.Id}: window {Window(focus)}, {focus.Status}{(focus.Reason is { } why ? " (" + TerminalText.Clean(why) + ")" : string.Empty)}, {focus.RowsRead.ToString(CultureInfo.InvariantCulture)} rows");
        output.WriteLine();
        WriteMoved(output, evidence, focus);
        output.WriteLine();
        WriteDecomposition(output, evidence);
        output.WriteLine();
        IReadOnlyList<string> features = EvidenceFacts.FeaturesInvolved(focus);
        output.WriteLine("Features involved: " + (features.Count == 0 ? "none named by this run's findings" : string.Join(", ", features)));
        output.WriteLine();
        WriteRunbook(output, ChecksOfInterest(evidence, focus));
        output.WriteLine();
        output.WriteLine(RunbookHints.Caution);
    }

    private static void WriteMoved(TextWriter output, Evidence evidence, EvidenceRun focus)
    {
        string? check = evidence.Alert?.Check;
        List<EvidenceFinding> critical = [.. focus.Findings.Where(f => f.Severity == "critical").OrderBy(f => f.Check == check ? 0 : 1)];
        List<EvidenceFinding> shown = critical.Count > 0 ? critical : [.. focus.Findings.Where(f => f.Severity == "warning")];
        output.WriteLine(critical.Count > 0
            ? $"What moved ({critical.Count.ToString(CultureInfo.InvariantCulture)} critical finding(s) in run {focus.Id.ToString(CultureInfo.InvariantCulture)}):"
            : shown.Count > 0 ? "What moved: nothing critical in this run; its warnings:" : "What moved: nothing above ok in this run.");
        foreach (EvidenceFinding f in shown)
        {
            output.WriteLine($"  [{f.Severity}] {f.Check} {f.Statistic} ({f.SubjectText}): {TerminalText.Clean(f.Explanation)}");
        }
    }

    private static void WriteDecomposition(TextWriter output, Evidence evidence)
    {
        if (evidence.Latest(CheckNames.Error, "chow_predictive") is not var (run, error))
        {
            output.WriteLine("Error decomposition: no run up to this one tested the error (windows overlap or too few rows)");
            return;
        }

        string from = run.Id == evidence.Focus?.Id ? "this run" : $"run {run.Id.ToString(CultureInfo.InvariantCulture)}, the latest that tested the error";
        output.WriteLine($"Error decomposition ({from}):");
        if (error.Detail("rmse") is { } rmse && error.Detail("mse_reference") is { } reference)
        {
            output.WriteLine($"  deployed RMSE {Num(rmse)} against the baseline's {Num(Math.Sqrt(reference))} (MSE {Signed(error.EffectSize)})");
        }

        if (error.Detail("share_noise") is { } noise && error.Detail("share_level_drift") is { } level && error.Detail("share_slope_drift") is { } slope)
        {
            output.WriteLine($"  of the error increase over baseline: noise {Pct(noise)}, level drift {Pct(level)}, slope drift {Pct(slope)}");
            output.WriteLine("  " + EvidenceFacts.SharesExplained);
        }
        else
        {
            output.WriteLine("  the error did not increase over baseline, so there is nothing to split");
        }
    }

    private static IReadOnlyList<string> ChecksOfInterest(Evidence evidence, EvidenceRun focus)
    {
        var checks = new List<string>();
        if (evidence.Alert is { } alert)
        {
            checks.Add(alert.Check);
        }

        checks.AddRange(focus.Findings.Where(f => f.Severity == "critical").Select(f => f.Check));
        if (checks.Count == 0)
        {
            checks.AddRange(focus.Findings.Where(f => f.Severity == "warning").Select(f => f.Check));
        }

        return [.. checks.Distinct(StringComparer.Ordinal)];
    }

    private static void WriteRunbook(TextWriter output, IReadOnlyList<string> checks)
    {
        foreach (string check in checks)
        {
            if (RunbookHints.For(check) is { } hint)
            {
                output.WriteLine($"Runbook, {hint.Check}:");
                output.WriteLine($"  What it means: {hint.Meaning}");
                output.WriteLine($"  How to confirm: {hint.Confirm}");
                output.WriteLine($"  What to do: {hint.Act}");
            }
        }
    }

    private static string Window(EvidenceRun run) =>
        run.WindowStart is { } s && run.WindowEnd is { } e ? $"{CliJson.Time(s)} → {CliJson.Time(e)}" : "none";

    private static string Num(double value) => EvidenceFacts.Num(value);

    private static string Pct(double share) => EvidenceFacts.Pct(share);

    private static string Signed(double? growth) => growth is { } g ? (g >= 0 ? "+" : string.Empty) + Pct(g) : "change unknown";
}
