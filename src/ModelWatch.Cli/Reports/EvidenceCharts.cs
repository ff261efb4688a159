using System.Globalization;
using ModelWatch.Checks.Findings;

namespace ModelWatch.Cli.Reports;

/// <summary>Builds the report's charts from the model's run history.</summary>
internal static class EvidenceCharts
{
    private const double Z95 = 1.959963984540054;

    private static readonly int[] ResidualTicks = [-4, -2, 0, 2, 4];

    /// <summary>One chart per coefficient: the refit with its 95 % interval, the baseline value, critical runs ringed.</summary>
    public static IEnumerable<string> Coefficients(Evidence evidence)
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
            var chart = new SvgChart($"coefficient of {term}", points.Min(p => p.X), points.Max(p => p.X), lo, hi);
            chart.Band([.. points.Select(p => (p.X, p.Low, p.High))], ChartPalette.RefitBand, "refit 95 % interval");
            chart.Line([.. points.Select(p => (p.X, p.Refit))], ChartPalette.Refit, "refit on the window");
            chart.Reference(points[^1].Baseline, ChartPalette.Baseline, "deployed (baseline)");
            chart.Marks([.. points.Where(p => p.Critical).Select(p => (p.X, p.Refit))], ChartPalette.Critical, "critical");
            TimeLabels(chart, points.Select(p => p.X));
            yield return chart.Render("coefficient");
        }
    }

    /// <summary>The deployed model's RMSE over time, and its MSE split into noise, level drift and slope drift.</summary>
    public static IEnumerable<string> Error(Evidence evidence)
    {
        var rows = evidence.Runs.Select(r => (Run: r, F: r.Find(CheckNames.Error, "chow_predictive"))).Where(x => x.F?.Detail("rmse") is not null).ToList();
        if (rows.Count == 0)
        {
            yield break;
        }

        double[] xs = [.. rows.Select(x => Time(x.Run))];
        double sRef = Math.Sqrt(rows[^1].F!.Detail("mse_reference") ?? double.NaN);
        (double lo, double hi) = Range(rows.Select(x => x.F!.Detail("rmse")!.Value).Append(sRef).Append(0));
        var rmse = new SvgChart("deployed RMSE of each run's window", xs.Min(), xs.Max(), lo, hi);
        rmse.Line([.. rows.Select((x, i) => (xs[i], x.F!.Detail("rmse")!.Value))], ChartPalette.Refit, "deployed RMSE");
        rmse.Reference(sRef, ChartPalette.Baseline, "baseline residual SD");
        rmse.Marks([.. rows.Select((x, i) => (X: xs[i], Y: x.F!.Detail("rmse")!.Value, C: x.F!.Severity == "critical")).Where(p => p.C).Select(p => (p.X, p.Y))], ChartPalette.Critical, "critical");
        TimeLabels(rmse, xs);
        yield return rmse.Render("error");

        var parts = rows.Where(x => x.F!.Detail("mse_noise") is not null).ToList();
        if (parts.Count == 0)
        {
            yield break;
        }

        double[] px = [.. parts.Select(x => Time(x.Run))];
        double span = px.Length > 1 ? (px.Max() - px.Min()) / px.Length : 3600;
        double top = Math.Max(parts.Max(x => x.F!.Detail("mse_deployed") ?? 0), double.IsFinite(sRef) ? sRef * sRef : 0);
        var mse = new SvgChart("MSE of the deployed coefficients, by source", px.Min() - span, px.Max() + span, 0, top > 0 ? top * 1.08 : 1);
        for (int i = 0; i < parts.Count; i++)
        {
            EvidenceFinding f = parts[i].F!;
            double noise = f.Detail("mse_noise") ?? 0, level = f.Detail("mse_level_drift") ?? 0, slope = Math.Max(0, f.Detail("mse_slope_drift") ?? 0);
            double x0 = px[i] - (span * 0.4), x1 = px[i] + (span * 0.4);
            mse.Bar(x0, x1, 0, noise, ChartPalette.Noise, "noise " + Num(noise));
            mse.Bar(x0, x1, noise, noise + level, ChartPalette.Level, "level drift " + Num(level));
            mse.Bar(x0, x1, noise + level, noise + level + slope, ChartPalette.Slope, "slope drift " + Num(slope));
        }

        mse.Legend(ChartPalette.Noise, "noise (refit MSE)");
        mse.Legend(ChartPalette.Level, "level drift");
        mse.Legend(ChartPalette.Slope, "slope drift");
        mse.Reference(sRef * sRef, ChartPalette.Baseline, "baseline MSE");
        TimeLabels(mse, px);
        yield return mse.Render("decomposition");
    }

    /// <summary>Histogram of the baseline's standardized residuals against the focus window's, on shared bins.</summary>
    public static string? Residuals(Evidence evidence)
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
        var chart = new SvgChart("standardized residuals: baseline against this window", -edge, edge, 0, Math.Max(baseDensity.Max(), windowDensity.DefaultIfEmpty(0).Max()) * 1.1);
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

        return chart.Render("residuals", evidence.WindowResidualsProblem is { } problem ? "Window residuals not shown: " + problem : $"Residual divided by its standard error; values beyond ±{edge.ToString(CultureInfo.InvariantCulture)} are counted in the end bins.");
    }

    /// <summary>PSI per feature in the latest run that measured it, against the warning and critical levels.</summary>
    public static string? Psi(Evidence evidence)
    {
        EvidenceRun? run = evidence.Latest(CheckNames.Features, "psi")?.Run;
        List<EvidenceFinding> psi = run is null ? [] : [.. run.Findings.Where(f => f.Check == CheckNames.Features && f.Statistic == "psi" && f.Value is not null)];
        if (psi.Count == 0)
        {
            return null;
        }

        var chart = new SvgChart($"population stability index by feature (run {run!.Id.ToString(CultureInfo.InvariantCulture)})", -0.5, psi.Count - 0.5, 0, Math.Max(0.3, psi.Max(f => f.Value!.Value) * 1.1));
        for (int i = 0; i < psi.Count; i++)
        {
            EvidenceFinding f = psi[i];
            chart.Bar(i - 0.3, i + 0.3, 0, f.Value!.Value, f.Severity == "critical" ? ChartPalette.Critical : f.Severity == "warning" ? ChartPalette.Level : ChartPalette.Refit, $"{f.SubjectText}: {Num(f.Value!.Value)}");
            chart.XLabel(i, f.SubjectText);
        }

        chart.Legend(ChartPalette.Refit, "PSI (critical red, warning gold)");
        chart.Reference(0.10, ChartPalette.Level, "0.10 warning level (common practice)");
        chart.Reference(0.25, ChartPalette.Critical, "0.25 critical level (common practice)");
        return chart.Render("psi");
    }

    /// <summary>The condition number of the window's design over time, against the baseline and the alarm level.</summary>
    public static string? Condition(Evidence evidence)
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
        var chart = new SvgChart("condition number of the window's design (log scale)", xs.Min(), xs.Max(), lo / 1.5, hi * 1.5, logY: true);
        chart.Line([.. xs.Zip(ys)], ChartPalette.Refit, "condition number");
        chart.Reference(reference ?? double.NaN, ChartPalette.Baseline, "baseline");
        chart.Reference(100, ChartPalette.Limit, "100 alarm level");
        chart.Marks([.. rows.Select((x, i) => (X: xs[i], Y: ys[i], C: x.F!.Severity == "critical")).Where(p => p.C).Select(p => (p.X, p.Y))], ChartPalette.Critical, "critical");
        TimeLabels(chart, xs);
        return chart.Render("condition");
    }

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

    private static void TimeLabels(SvgChart chart, IEnumerable<double> xs)
    {
        double[] all = [.. xs.Distinct().Order()];
        foreach (double x in all.Length <= 2 ? all : new[] { all[0], all[all.Length / 2], all[^1] })
        {
            chart.XLabel(x, DateTimeOffset.FromUnixTimeSeconds((long)x).ToString("MM-dd HH:mm", CultureInfo.InvariantCulture));
        }
    }

    private static double Time(EvidenceRun run) => run.At.ToUnixTimeSeconds();

    private static string Num(double v) => v.ToString("G4", CultureInfo.InvariantCulture);
}
