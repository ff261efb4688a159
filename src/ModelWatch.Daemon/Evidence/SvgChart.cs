using System.Globalization;
using System.Net;
using System.Text;

namespace ModelWatch.Daemon.Evidence;

/// <summary>
/// A small chart drawn as plain SVG: a plot area with a fixed viewBox (so it scales to any screen width), axis titles,
/// y ticks, x labels (dated ticks for time axes), and data shapes marked <c>class="data"</c>. Every legend entry is
/// added by the call that draws its mark, with the same colour and a swatch of the same shape. Nothing is scripted.
/// </summary>
internal sealed class SvgChart(string title, string xTitle, string yTitle, double xMin, double xMax, double yMin, double yMax, bool logY = false)
{
    private const double Width = 560;
    private const double Height = 330;
    private const double Left = 62;
    private const double Right = 16;
    private const double Top = 50;
    private const double Bottom = 74;

    private static readonly double[] NiceSteps = [1.0, 2.0, 2.5, 5.0, 10.0];

    private static readonly (TimeSpan Step, string Format)[] TimeSteps =
    [
        (TimeSpan.FromMinutes(15), "HH:mm"), (TimeSpan.FromMinutes(30), "HH:mm"), (TimeSpan.FromHours(1), "HH:mm"),
        (TimeSpan.FromHours(2), "HH:mm"), (TimeSpan.FromHours(3), "HH:mm"), (TimeSpan.FromHours(6), "HH:mm"),
        (TimeSpan.FromHours(12), "HH:mm"), (TimeSpan.FromDays(1), string.Empty), (TimeSpan.FromDays(2), string.Empty),
        (TimeSpan.FromDays(7), string.Empty), (TimeSpan.FromDays(14), string.Empty), (TimeSpan.FromDays(28), string.Empty),
        (TimeSpan.FromDays(91), string.Empty), (TimeSpan.FromDays(182), string.Empty), (TimeSpan.FromDays(364), string.Empty),
    ];

    private readonly StringBuilder _background = new();
    private readonly StringBuilder _shapes = new();
    private readonly List<(string Color, string Label, string Swatch)> _legend = [];
    private readonly List<(string Color, string Label, string Swatch)> _context = [];
    private readonly List<(double X, string Line1, string? Line2)> _xLabels = [];

    /// <summary>Shades the area between a lower and an upper curve.</summary>
    public void Band(IReadOnlyList<(double X, double Low, double High)> points, string fill, string label)
    {
        if (points.Count == 0)
        {
            return;
        }

        IEnumerable<string> upper = points.Select(p => Pt(p.X, p.High));
        IEnumerable<string> lower = points.Reverse().Select(p => Pt(p.X, p.Low));
        _shapes.Append(Fmt($"<polygon class=\"data\" points=\"{string.Join(" ", upper.Concat(lower))}\" fill=\"{fill}\" fill-opacity=\"0.45\" stroke=\"none\"/>"));
        _legend.Add((fill, label, "band"));
    }

    /// <summary>A line through the points, with a dot on each (so a single run still shows).</summary>
    public void Line(IReadOnlyList<(double X, double Y)> points, string color, string label, bool dots = true)
    {
        if (points.Count == 0)
        {
            return;
        }

        _shapes.Append(Fmt($"<polyline class=\"data\" points=\"{string.Join(" ", points.Select(p => Pt(p.X, p.Y)))}\" fill=\"none\" stroke=\"{color}\" stroke-width=\"2\" stroke-linejoin=\"round\"/>"));
        if (dots && points.Count <= 60)
        {
            foreach ((double x, double y) in points)
            {
                _shapes.Append(Fmt($"<circle class=\"data\" cx=\"{N(X(x))}\" cy=\"{N(Y(y))}\" r=\"2.6\" fill=\"{color}\"/>"));
            }
        }

        _legend.Add((color, label, "line"));
    }

    /// <summary>Rings the points where something was critical.</summary>
    public void Marks(IReadOnlyList<(double X, double Y)> points, string color, string label)
    {
        foreach ((double x, double y) in points)
        {
            _shapes.Append(Fmt($"<circle class=\"data\" cx=\"{N(X(x))}\" cy=\"{N(Y(y))}\" r=\"5.5\" fill=\"none\" stroke=\"{color}\" stroke-width=\"2\"/>"));
        }

        if (points.Count > 0)
        {
            _legend.Add((color, label, "ring"));
        }
    }

    /// <summary>A horizontal reference line across the plot.</summary>
    public void Reference(double y, string color, string label)
    {
        if (!double.IsFinite(y) || (logY && y <= 0))
        {
            return;
        }

        _shapes.Append(Fmt($"<line class=\"data\" x1=\"{N(Left)}\" x2=\"{N(Width - Right)}\" y1=\"{N(Y(y))}\" y2=\"{N(Y(y))}\" stroke=\"{color}\" stroke-width=\"1.6\" stroke-dasharray=\"6 4\"/>"));
        _legend.Add((color, label, "dashed"));
    }

    /// <summary>Shades a stretch of the x axis behind the data (the alert's open period).</summary>
    public void Period(double x0, double x1, string fill, string label)
    {
        double a = Math.Clamp(X(x0), Left, Width - Right), b = Math.Clamp(X(x1), Left, Width - Right);
        if (b - a < 3)
        {
            (a, b) = (Math.Max(Left, a - 1.5), Math.Min(Width - Right, a + 1.5));
        }

        _background.Append(Fmt($"<rect class=\"period\" x=\"{N(a)}\" y=\"{N(Top)}\" width=\"{N(b - a)}\" height=\"{N(Height - Top - Bottom)}\" fill=\"{fill}\" fill-opacity=\"0.55\"/>"));
        _context.Add((fill, label, "period"));
    }

    /// <summary>A vertical line at one x (the run the evidence comes from), labelled in the legend.</summary>
    public void Marker(double x, string color, string label)
    {
        if (x < xMin || x > xMax)
        {
            return;
        }

        _shapes.Append(Fmt($"<line class=\"marker\" x1=\"{N(X(x))}\" x2=\"{N(X(x))}\" y1=\"{N(Top)}\" y2=\"{N(Height - Bottom)}\" stroke=\"{color}\" stroke-width=\"1.6\" stroke-dasharray=\"2 3\"/>"));
        _context.Add((color, label, "marker"));
    }

    /// <summary>A filled rectangle between two x and two y values; its legend entry is added once with <see cref="Legend"/>.</summary>
    public void Bar(double x0, double x1, double y0, double y1, string fill, string? tooltip = null)
    {
        double top = Math.Min(Y(y0), Y(y1));
        double height = Math.Max(Math.Abs(Y(y0) - Y(y1)), 0.8);
        string tip = tooltip is null ? string.Empty : "<title>" + WebUtility.HtmlEncode(tooltip) + "</title>";
        _shapes.Append(Fmt($"<rect class=\"data\" x=\"{N(X(x0))}\" y=\"{N(top)}\" width=\"{N(Math.Max(X(x1) - X(x0), 0.8))}\" height=\"{N(height)}\" fill=\"{fill}\">{tip}</rect>"));
    }

    /// <summary>Adds a legend entry for shapes drawn with <see cref="Bar"/>.</summary>
    public void Legend(string color, string label) => _legend.Add((color, label, "bar"));

    /// <summary>A label under the x axis.</summary>
    public void XLabel(double x, string label) => _xLabels.Add((x, label, null));

    /// <summary>
    /// Dated ticks for an axis of Unix seconds: a round step that gives three to six ticks, each labelled with its date
    /// (year included) and, for steps under a day, its time; the axis title says UTC.
    /// </summary>
    public void TimeTicks()
    {
        double span = xMax - xMin;
        if (!(span > 0))
        {
            DateTime only = DateTimeOffset.FromUnixTimeSeconds((long)xMin).UtcDateTime;
            _xLabels.Add((xMin, only.ToString("yyyy-MM-dd", CultureInfo.InvariantCulture), only.ToString("HH:mm", CultureInfo.InvariantCulture)));
            return;
        }

        (TimeSpan step, string format) = TimeSteps.FirstOrDefault(s => span / s.Step.TotalSeconds <= 4, TimeSteps[^1]);
        long stepSeconds = (long)step.TotalSeconds;
        for (long t = (long)Math.Ceiling(xMin / stepSeconds) * stepSeconds; t <= xMax; t += stepSeconds)
        {
            DateTime at = DateTimeOffset.FromUnixTimeSeconds(t).UtcDateTime;
            _xLabels.Add((t, at.ToString("yyyy-MM-dd", CultureInfo.InvariantCulture), format.Length == 0 ? null : at.ToString(format, CultureInfo.InvariantCulture)));
        }
    }

    /// <summary>The figure: the SVG and its legend.</summary>
    public string Render(string chart, string? note = null, string? subject = null)
    {
        var svg = new StringBuilder();
        string subjectAttribute = subject is null ? string.Empty : $" data-subject=\"{Enc(subject)}\"";
        svg.Append(Fmt($"<figure class=\"chart\" data-chart=\"{chart}\"{subjectAttribute}><svg viewBox=\"0 0 {N(Width)} {N(Height)}\" role=\"img\" aria-label=\"{Enc(title)}\" preserveAspectRatio=\"xMidYMid meet\">"));
        svg.Append(Fmt($"<text x=\"8\" y=\"20\" class=\"title\">{Enc(title)}</text>"));
        svg.Append(Fmt($"<rect x=\"{N(Left)}\" y=\"{N(Top)}\" width=\"{N(Width - Left - Right)}\" height=\"{N(Height - Top - Bottom)}\" class=\"plot\"/>"));
        svg.Append(_background);
        foreach (double tick in YTicks())
        {
            svg.Append(Fmt($"<line x1=\"{N(Left)}\" x2=\"{N(Width - Right)}\" y1=\"{N(Y(tick))}\" y2=\"{N(Y(tick))}\" class=\"grid\"/>"));
            svg.Append(Fmt($"<text x=\"{N(Left - 6)}\" y=\"{N(Y(tick) + 4)}\" class=\"tick\" text-anchor=\"end\">{Enc(Tick(tick))}</text>"));
        }

        double lastRight = double.NegativeInfinity;
        int shown = 0;
        foreach ((double x, string line1, string? line2) in _xLabels.OrderBy(l => l.X))
        {
            // Labels at the plot's edges hang inwards so that they are not cut off; a label that would touch the one
            // before it is left out (widths estimated at 7.5 units a character, the desktop font).
            string anchor = X(x) < Left + 36 ? "start" : X(x) > Width - Right - 36 ? "end" : "middle";
            double half = Math.Max(line1.Length, line2?.Length ?? 0) * 7.5;
            (double from, double to) = anchor switch { "start" => (X(x), X(x) + half), "end" => (X(x) - half, X(x)), _ => (X(x) - (half / 2), X(x) + (half / 2)) };
            if (from < lastRight + 8)
            {
                continue;
            }

            lastRight = to;

            // On a phone every other label is hidden (class alt): the font grows there, the chart does not.
            string alt = _xLabels.Count > 3 && shown++ % 2 == 1 ? " alt" : string.Empty;
            svg.Append(Fmt($"<line x1=\"{N(X(x))}\" x2=\"{N(X(x))}\" y1=\"{N(Height - Bottom)}\" y2=\"{N(Height - Bottom + 4)}\" class=\"axis\"/>"));
            svg.Append(Fmt($"<text x=\"{N(X(x))}\" y=\"{N(Height - Bottom + 17)}\" class=\"tick xtick{alt}\" text-anchor=\"{anchor}\">{Enc(line1)}"));
            if (line2 is not null)
            {
                svg.Append(Fmt($"<tspan x=\"{N(X(x))}\" dy=\"1.15em\">{Enc(line2)}</tspan>"));
            }

            svg.Append("</text>");
        }

        svg.Append(Fmt($"<text x=\"{N(Left + ((Width - Left - Right) / 2))}\" y=\"{N(Height - 6)}\" class=\"axis-title\" text-anchor=\"middle\">{Enc(xTitle)}</text>"));

        // The y axis title sits above the plot, read left to right: rotated, a long title with its unit would not fit.
        svg.Append(Fmt($"<text x=\"8\" y=\"{N(Top - 10)}\" class=\"axis-title\">↑ {Enc(yTitle)}</text>"));
        svg.Append(_shapes);
        svg.Append("</svg>");
        svg.Append("<ul class=\"legend\">");
        foreach ((string color, string label, string swatch) in _legend.Concat(_context).DistinctBy(l => l.Label))
        {
            svg.Append(Fmt($"<li><span class=\"key {swatch}\" style=\"--key:{color}\"></span>{Enc(label)}</li>"));
        }

        svg.Append("</ul>");
        if (note is not null)
        {
            svg.Append("<figcaption>" + Enc(note) + "</figcaption>");
        }

        svg.Append("</figure>");
        return svg.ToString();
    }

    private IEnumerable<double> YTicks()
    {
        if (!double.IsFinite(yMin) || !double.IsFinite(yMax) || yMax <= yMin || (logY && yMin <= 0))
        {
            yield break;
        }

        if (logY)
        {
            for (double d = Math.Floor(Math.Log10(yMin)); d <= Math.Ceiling(Math.Log10(yMax)); d++)
            {
                double v = Math.Pow(10, d);
                if (v >= yMin && v <= yMax)
                {
                    yield return v;
                }
            }

            yield break;
        }

        double raw = (yMax - yMin) / 4;
        double magnitude = Math.Pow(10, Math.Floor(Math.Log10(raw)));
        double step = NiceSteps.Select(m => m * magnitude).First(s => s >= raw);
        for (double v = Math.Ceiling(yMin / step) * step; v <= yMax + (step * 1e-9); v += step)
        {
            yield return Math.Abs(v) < step * 1e-9 ? 0 : v;
        }
    }

    private double X(double x) => xMax > xMin ? Left + ((x - xMin) / (xMax - xMin) * (Width - Left - Right)) : (Left + Width - Right) / 2;

    private double Y(double y)
    {
        (double lo, double hi, double v) = logY ? (Math.Log10(yMin), Math.Log10(yMax), Math.Log10(Math.Max(y, yMin))) : (yMin, yMax, y);
        double clamped = Math.Clamp(v, lo, hi);
        return hi > lo ? Height - Bottom - ((clamped - lo) / (hi - lo) * (Height - Top - Bottom)) : (Top + Height - Bottom) / 2;
    }

    private string Pt(double x, double y) => N(X(x)) + "," + N(Y(y));

    private static string Tick(double v) => Math.Abs(v) >= 10000 || (Math.Abs(v) < 0.01 && v != 0) ? v.ToString("0.#e0", CultureInfo.InvariantCulture) : v.ToString("0.###", CultureInfo.InvariantCulture);

    private static string N(double v) => v.ToString("0.##", CultureInfo.InvariantCulture);

    private static string Enc(string text) => WebUtility.HtmlEncode(text);

    private static string Fmt(FormattableString text) => text.ToString(CultureInfo.InvariantCulture);
}
