using System.Globalization;
using ModelWatch.Checks.Collinearity;
using ModelWatch.Checks.Findings;

namespace ModelWatch.Daemon.Evidence;

/// <summary>
/// Builds the report's charts from the model's run history. Every time axis is dated in UTC; when the evidence is an
/// alert's, its open period is shaded and the run the evidence comes from is marked.
/// </summary>
internal static class EvidenceCharts
{
    private const double Z95 = 1.959963984540054;

    private const string TimeAxis = "end of each run's window (UTC)";

    private static readonly int[] ResidualTicks = [-4, -2, 0, 2, 4];

    private static readonly string[] Severities = ["ok", "warning", "critical"];

    /// <summary>Every chart the history supports, the alert's subject first, then in the order a run evaluates the checks.</summary>
    public static IReadOnlyList<EvidenceChart> All(Evidence evidence)
    {
        List<EvidenceChart> charts =
        [
            .. Coefficients(evidence), .. Error(evidence), .. Some(Residuals(evidence)), .. Some(Psi(evidence)),
            .. Vif(evidence), .. Some(Condition(evidence)),
        ];
        return evidence.Alert is { } alert ? [.. charts.OrderBy(c => c.IsAbout(alert.Check, alert.Subject) ? 0 : 1)] : charts;
    }

    /// <summary>One chart per coefficient: the refit with its 95 % interval, the baseline value, critical runs ringed.</summary>
    public static IEnumerable<EvidenceChart> Coefficients(Evidence evidence)
    {
        if (evidence.Baseline is not { } stored)
        {
            yield break;
        }

        IReadOnlyList<string> terms = stored.Reference.ToLayout().Terms;
        for (int j = 0; j < terms.Count; j++)
        {
            string term = terms[j];
            double? seRef = stored.Reference.Covariance is { } v ? Math.Sqrt(v[j][j]) : stored.Reference.StandardErrors?[j];
            var points = new List<(double X, double Refit, double Low, double High, double Baseline, bool Critical)>();
            foreach (EvidenceRun run in evidence.Runs)
            {
                if (run.Find(CheckNames.Coefficients, "z", term) is not { } f || f.Detail("refit") is not { } refit || f.Detail("baseline") is not { } b0)
                {
                    continue;
                }

                // z = δ/√(V_new + V_ref): the refit's own standard error is what remains after the baseline's part.
                double se = f.Value is { } z && Math.Abs(z) > 1e-12 ? Math.Abs((refit - b0) / z) : double.NaN;
                if (seRef is { } sr && double.IsFinite(se))
                {
                    se = Math.Sqrt(Math.Max(0, (se * se) - (sr * sr)));
                }

                double half = double.IsFinite(se) ? Z95 * se : 0;
                points.Add((Time(run), refit, refit - half, refit + half, b0, f.Severity == "critical"));
            }

            if (points.Count == 0)
            {
                continue;
            }

            (double lo, double hi) = Range(points.SelectMany(p => new[] { p.Low, p.High, p.Baseline }));
            var chart = new SvgChart($"coefficient of {term}", TimeAxis, CoefficientAxis(evidence, term), points.Min(p => p.X), points.Max(p => p.X), lo, hi);
            Decorate(chart, evidence);
            chart.Band([.. points.Select(p => (p.X, p.Low, p.High))], ChartPalette.RefitBand, "refit's 95 % interval");
            chart.Line([.. points.Select(p => (p.X, p.Refit))], ChartPalette.Refit, "refit on each window");
            chart.Reference(points[^1].Baseline, ChartPalette.Baseline, "deployed value (baseline)");
            chart.Marks([.. points.Where(p => p.Critical).Select(p => (p.X, p.Refit))], ChartPalette.Critical, "critical run");
            chart.TimeTicks();
            yield return new EvidenceChart(CheckNames.Coefficients, term, chart.Render("coefficient", subject: term));
        }
    }

    /// <summary>The deployed model's RMSE over time, and its MSE split into noise, level drift and slope drift.</summary>
    public static IEnumerable<EvidenceChart> Error(Evidence evidence)
    {
        var rows = evidence.Runs.Select(r => (Run: r, F: r.Find(CheckNames.Error, "chow_predictive"))).Where(x => x.F?.Detail("rmse") is not null).ToList();
        if (rows.Count == 0)
        {
            yield break;
        }

        string unit = " (" + (evidence.Outcome?.Unit ?? "outcome units") + ")";
        string squared = " (" + (evidence.Outcome?.Unit ?? "outcome units") + "²)";
        double[] xs = [.. rows.Select(x => Time(x.Run))];
        double sRef = Math.Sqrt(rows[^1].F!.Detail("mse_reference") ?? double.NaN);
        (double lo, double hi) = Range(rows.Select(x => x.F!.Detail("rmse")!.Value).Append(sRef).Append(0));
        var rmse = new SvgChart("prediction error of the deployed model", TimeAxis, "RMSE" + unit, xs.Min(), xs.Max(), Math.Max(0, lo), hi);
        Decorate(rmse, evidence);
        rmse.Line([.. rows.Select((x, i) => (xs[i], x.F!.Detail("rmse")!.Value))], ChartPalette.Refit, "deployed RMSE on each window");
        rmse.Reference(sRef, ChartPalette.Baseline, "baseline residual SD");
        rmse.Marks([.. rows.Select((x, i) => (X: xs[i], Y: x.F!.Detail("rmse")!.Value, C: x.F!.Severity == "critical")).Where(p => p.C).Select(p => (p.X, p.Y))], ChartPalette.Critical, "critical run");
        rmse.TimeTicks();
        yield return new EvidenceChart(CheckNames.Error, null, rmse.Render("error"));

        var parts = rows.Where(x => x.F!.Detail("mse_noise") is not null).ToList();
        if (parts.Count == 0)
        {
            yield break;
        }

        double[] px = [.. parts.Select(x => Time(x.Run))];
        double span = px.Length > 1 ? (px.Max() - px.Min()) / px.Length : 3600;
        double top = Math.Max(parts.Max(x => x.F!.Detail("mse_deployed") ?? 0), double.IsFinite(sRef) ? sRef * sRef : 0);
        var mse = new SvgChart("where the squared error comes from", TimeAxis, "MSE" + squared, px.Min() - span, px.Max() + span, 0, top > 0 ? top * 1.08 : 1);
        Decorate(mse, evidence);
        for (int i = 0; i < parts.Count; i++)
        {
            EvidenceFinding f = parts[i].F!;
            double noise = f.Detail("mse_noise") ?? 0, level = f.Detail("mse_level_drift") ?? 0, slope = Math.Max(0, f.Detail("mse_slope_drift") ?? 0);
            double x0 = px[i] - (span * 0.4), x1 = px[i] + (span * 0.4);
            mse.Bar(x0, x1, 0, noise, ChartPalette.Noise, "noise " + Num(noise));
            mse.Bar(x0, x1, noise, noise + level, ChartPalette.Level, "level drift " + Num(level));
            mse.Bar(x0, x1, noise + level, noise + level + slope, ChartPalette.Slope, "slope drift " + Num(slope));
        }

        mse.Legend(ChartPalette.Noise, "noise (the refit's own MSE)");
        mse.Legend(ChartPalette.Level, "level drift");
        mse.Legend(ChartPalette.Slope, "slope drift");
        mse.Reference(sRef * sRef, ChartPalette.Baseline, "baseline MSE");
        mse.TimeTicks();
        yield return new EvidenceChart(CheckNames.Error, null, mse.Render("decomposition", "Each bar is one run's deployed MSE stacked from its sources; the part above the dashed baseline line is the increase the shares split."));
    }

    /// <summary>Histogram of the baseline's standardized residuals against the focus window's, on shared bins.</summary>
    public static EvidenceChart? Residuals(Evidence evidence)
    {
        IReadOnlyList<double> reference = evidence.Baseline?.Reference.ResidualSample ?? [];
        if (reference.Count == 0)
        {
            return null;
        }

        // Wide enough for the bulk of the baseline and all of the window (a biased window can sit far from zero),
        // at least ±4 and at most ±40.
        double widest = Math.Max(Quantile(reference.Select(Math.Abs), 0.995), Quantile(evidence.WindowResiduals.Select(Math.Abs), 1.0));
        double edge = Math.Min(40, Math.Max(4, Math.Ceiling(widest * 1.05)));
        const int bins = 24;
        double[] baseDensity = Density(reference, bins, edge);
        double[] windowDensity = evidence.WindowResiduals.Count > 0 ? Density(evidence.WindowResiduals, bins, edge) : [];
        double width = 2 * edge / bins;
        var chart = new SvgChart("residuals: baseline against this window", "residual ÷ its standard error (unitless)", "share of residuals per bin",
            -edge, edge, 0, Math.Max(baseDensity.Max(), windowDensity.DefaultIfEmpty(0).Max()) * 1.1);
        for (int b = 0; b < bins; b++)
        {
            chart.Bar(-edge + (b * width) + (width * 0.05), -edge + ((b + 1) * width) - (width * 0.05), 0, baseDensity[b], ChartPalette.BaselineBars);
        }

        chart.Legend(ChartPalette.BaselineBars, $"baseline ({reference.Count.ToString(CultureInfo.InvariantCulture)} residuals)");
        if (windowDensity.Length > 0)
        {
            chart.Line([.. windowDensity.Select((d, b) => (-edge + ((b + 0.5) * width), d))], ChartPalette.Refit, $"this window ({evidence.WindowResiduals.Count.ToString(CultureInfo.InvariantCulture)} residuals)");
        }

        foreach (double x in ResidualTicks.Select(t => t * edge / 4))
        {
            chart.XLabel(x, x.ToString("0.#", CultureInfo.InvariantCulture));
        }

        return new EvidenceChart(CheckNames.Residuals, null, chart.Render("residuals", evidence.WindowResidualsProblem is { } problem
            ? "Window residuals not shown: " + problem
            : $"Values beyond ±{edge.ToString(CultureInfo.InvariantCulture)} are counted in the end bins. A window curve shifted sideways means biased predictions; a wider one, a noisier outcome."));
    }

    /// <summary>PSI per feature in the latest run that measured it, coloured by the finding's severity.</summary>
    public static EvidenceChart? Psi(Evidence evidence)
    {
        EvidenceRun? run = evidence.Latest(CheckNames.Features, "psi")?.Run;
        List<EvidenceFinding> psi = run is null ? [] : [.. run.Findings.Where(f => f.Check == CheckNames.Features && f.Statistic == "psi" && f.Value is not null)];
        if (psi.Count == 0)
        {
            return null;
        }

        var chart = new SvgChart($"feature drift in run {run!.Id.ToString(CultureInfo.InvariantCulture)} ({EvidenceFacts.Readable(run.At)})", "feature", "PSI (unitless)",
            -0.5, psi.Count - 0.5, 0, Math.Max(0.3, psi.Max(f => f.Value!.Value) * 1.1));
        for (int i = 0; i < psi.Count; i++)
        {
            EvidenceFinding f = psi[i];
            chart.Bar(i - 0.3, i + 0.3, 0, f.Value!.Value, ChartPalette.Of(f.Severity), $"{f.SubjectText}: {Num(f.Value!.Value)} ({f.Severity})");
            chart.XLabel(i, f.SubjectText);
        }

        foreach (string severity in Severities.Where(s => psi.Any(f => SeverityOf(f) == s)))
        {
            chart.Legend(ChartPalette.Of(severity), "PSI, finding " + severity);
        }

        chart.Reference(0.10, ChartPalette.Warning, "0.10: moderate shift (common practice)");
        chart.Reference(0.25, ChartPalette.Critical, "0.25: large shift (common practice)");
        return new EvidenceChart(CheckNames.Features, null, chart.Render("psi", "A bar's colour is its finding's severity, decided by the feature test (not by the 0.10 and 0.25 rules of thumb)."));
    }

    /// <summary>Each feature's variance inflation factor over time (log scale), against the alarm level.</summary>
    public static IEnumerable<EvidenceChart> Vif(Evidence evidence)
    {
        var series = evidence.Runs
            .SelectMany(r => r.Findings.Where(f => f.Check == CheckNames.Collinearity && f.Statistic == "vif" && f.Skipped is null && f.Value is > 0 && f.Subject is not null)
                .Select(f => (Run: r, F: f)))
            .GroupBy(x => x.F.Subject!, StringComparer.Ordinal)
            .ToList();
        if (series.Count == 0)
        {
            yield break;
        }

        double[] all = [.. series.SelectMany(g => g.Select(x => x.F.Value!.Value))];
        double alarm = CollinearityCheck.VifAlarm.Default;
        double lo = Math.Min(all.Min(), 1), hi = Math.Max(all.Max(), alarm);
        double x0 = series.Min(g => g.Min(x => Time(x.Run))), x1 = series.Max(g => g.Max(x => Time(x.Run)));
        var chart = new SvgChart("variance inflation factor of each feature", TimeAxis, "VIF (unitless, log scale)", x0, x1, lo / 1.3, hi * 1.5, logY: true);
        Decorate(chart, evidence);
        int i = 0;
        foreach (var feature in series)
        {
            string color = ChartPalette.Series[i++ % ChartPalette.Series.Count];
            chart.Line([.. feature.Select(x => (Time(x.Run), x.F.Value!.Value))], color, feature.Key);
            chart.Marks([.. feature.Where(x => x.F.Severity == "critical").Select(x => (Time(x.Run), x.F.Value!.Value))], ChartPalette.Critical, "critical run");
        }

        chart.Reference(alarm, ChartPalette.Limit, $"{Num(alarm)}: default alarm level (Marquardt 1970)");
        chart.TimeTicks();
        string? subject = evidence.Alert is { Check: CheckNames.Collinearity, Subject: { } s } ? s : null;
        yield return new EvidenceChart(CheckNames.Collinearity, subject, chart.Render("vif", "A VIF of k means the feature's coefficient has k times the variance it would have if the feature were unrelated to the others."));
    }

    /// <summary>The condition number of the window's design over time, against the baseline and the alarm level.</summary>
    public static EvidenceChart? Condition(Evidence evidence)
    {
        var rows = evidence.Runs.Select(r => (Run: r, F: r.Find(CheckNames.Collinearity, "condition_number"))).Where(x => x.F?.Value is > 0).ToList();
        if (rows.Count == 0)
        {
            return null;
        }

        double[] xs = [.. rows.Select(x => Time(x.Run))];
        double[] ys = [.. rows.Select(x => x.F!.Value!.Value)];
        double? reference = rows[^1].F!.Detail("baseline_condition_number");
        double lo = Math.Min(ys.Min(), reference ?? double.MaxValue), hi = Math.Max(Math.Max(ys.Max(), reference ?? 0), 100);
        var chart = new SvgChart("condition number of the window's design", TimeAxis, "condition number (log scale)", xs.Min(), xs.Max(), lo / 1.5, hi * 1.5, logY: true);
        Decorate(chart, evidence);
        chart.Line([.. xs.Zip(ys)], ChartPalette.Refit, "condition number of each window");
        chart.Reference(reference ?? double.NaN, ChartPalette.Baseline, "baseline");
        chart.Reference(100, ChartPalette.Limit, "100: alarm level");
        chart.Marks([.. rows.Select((x, i) => (X: xs[i], Y: ys[i], C: x.F!.Severity == "critical")).Where(p => p.C).Select(p => (p.X, p.Y))], ChartPalette.Critical, "critical run");
        chart.TimeTicks();
        return new EvidenceChart(CheckNames.Collinearity, null, chart.Render("condition"));
    }

    /// <summary>Shades the alert's open period and marks the run the evidence comes from.</summary>
    private static void Decorate(SvgChart chart, Evidence evidence)
    {
        if (evidence.Alert is { } alert)
        {
            double start = evidence.Runs.FirstOrDefault(r => r.Id == alert.FirstRunId) is { } first ? Time(first) : new DateTimeOffset(DateTime.SpecifyKind(alert.OpenedAt, DateTimeKind.Utc)).ToUnixTimeSeconds();
            double end = alert.ResolvedAt is null ? double.PositiveInfinity
                : evidence.Runs.FirstOrDefault(r => r.Id == alert.LastRunId) is { } last ? Time(last)
                : new DateTimeOffset(DateTime.SpecifyKind(alert.ResolvedAt.Value, DateTimeKind.Utc)).ToUnixTimeSeconds();
            string label = $"alert #{alert.Id.ToString(CultureInfo.InvariantCulture)} {(alert.ResolvedAt is null ? "open" : "open until resolved")}";
            chart.Period(start, end, ChartPalette.OpenPeriod, label);
        }

        if (evidence.Focus is { } focus)
        {
            chart.Marker(Time(focus), ChartPalette.EvidenceRun, $"{(evidence.Alert is not null ? "evidence run" : evidence.Id == focus.Id ? "this run" : "latest run")} #{focus.Id.ToString(CultureInfo.InvariantCulture)}");
        }
    }

    private static string CoefficientAxis(Evidence evidence, string term)
    {
        if (evidence.Outcome?.Unit is not { } unit)
        {
            return "coefficient (outcome units" + (term == "(intercept)" ? ")" : " per unit of " + term + ")");
        }

        return term == "(intercept)" ? "coefficient (" + unit + ")" : "coefficient (" + unit + " per unit of " + term + ")";
    }

    private static string SeverityOf(EvidenceFinding f) => f.Severity is "critical" or "warning" ? f.Severity : "ok";

    private static IEnumerable<EvidenceChart> Some(EvidenceChart? chart) => chart is null ? [] : [chart];

    private static double[] Density(IReadOnlyList<double> values, int bins, double edge)
    {
        double[] counts = new double[bins];
        foreach (double v in values.Where(double.IsFinite))
        {
            counts[Math.Clamp((int)Math.Floor((v + edge) / (2 * edge) * bins), 0, bins - 1)]++;
        }

        double total = Math.Max(1, counts.Sum());
        return [.. counts.Select(c => c / total)];
    }

    private static double Quantile(IEnumerable<double> values, double q)
    {
        double[] sorted = [.. values.Where(double.IsFinite).Order()];
        return sorted.Length == 0 ? 0 : sorted[Math.Min(sorted.Length - 1, (int)(q * sorted.Length))];
    }

    private static (double Low, double High) Range(IEnumerable<double> values)
    {
        double[] finite = [.. values.Where(double.IsFinite)];
        double lo = finite.Min(), hi = finite.Max();
        double pad = hi > lo ? (hi - lo) * 0.08 : Math.Max(Math.Abs(hi) * 0.1, 1);
        return (lo - pad, hi + pad);
    }

    private static double Time(EvidenceRun run) => run.At.ToUnixTimeSeconds();

    private static string Num(double v) => v.ToString("G4", CultureInfo.InvariantCulture);
}
