using System.Net;
using System.Text;

namespace ModelWatch.Daemon.Evidence;

/// <summary>
/// The frame of every ModelWatch page (the evidence report and the daemon's web pages): one inline style sheet, no
/// script, no font or image from anywhere. Tables turn into labelled cards on a phone; charts fill the grid's rows.
/// </summary>
internal static class PageLayout
{
    private const string Style = """
        :root { color-scheme: light; }
        * { box-sizing: border-box; }
        body { font-family: system-ui, -apple-system, "Segoe UI", sans-serif; margin: 0; background: #f6f4ef; color: #1f2328; line-height: 1.45; }
        main { max-width: 1180px; margin: 0 auto; padding: 12px 16px 40px; }
        nav { font-size: 0.9rem; margin-bottom: 6px; }
        a { color: #174d78; }
        h1 { font-size: 1.35rem; margin: 0.2rem 0 0.5rem; overflow-wrap: anywhere; }
        h2 { font-size: 1.1rem; margin: 1.6rem 0 0.5rem; border-bottom: 2px solid #d8d2c4; padding-bottom: 0.2rem; }
        p, li, dd { overflow-wrap: break-word; }
        .caution { background: #fff6df; border-left: 5px solid #c0621b; padding: 0.6rem 0.8rem; margin: 0.8rem 0; }
        .explain { background: #eef3f7; border-left: 5px solid #1d5c8f; padding: 0.6rem 0.8rem; margin: 0.6rem 0; }
        .facts { margin: 0; padding-left: 1.1rem; }
        .finding { margin: 0.35rem 0; }
        .sev { display: inline-block; min-width: 4.8em; font-weight: 600; }
        .sev.critical { color: #b3123f; } .sev.warning { color: #8a6100; } .sev.ok { color: #2e6b4f; } .sev.failed { color: #b3123f; }
        .charts { display: grid; grid-template-columns: repeat(auto-fill, minmax(min(100%, 460px), 1fr)); gap: 12px; }
        .charts > figure:last-child:nth-child(odd) { grid-column: 1 / -1; }
        .charts > figure:last-child:nth-child(odd) svg { max-height: 440px; }
        figure.chart { margin: 0; background: #fff; border: 1px solid #ddd6c8; border-radius: 6px; padding: 6px 8px; min-width: 0; }
        figure.chart svg { width: 100%; height: auto; display: block; }
        svg .title { font-size: 17px; font-weight: 600; fill: #1f2328; }
        svg .tick { font-size: 13px; fill: #4a4f55; }
        svg .axis-title { font-size: 14px; fill: #1f2328; }
        svg .axis { stroke: #8c8577; }
        svg .plot { fill: #fbfaf7; stroke: #cfc8b8; }
        svg .grid { stroke: #e6e0d4; stroke-width: 1; }
        ul.legend { list-style: none; margin: 4px 0 0; padding: 0; display: flex; flex-wrap: wrap; gap: 4px 14px; font-size: 0.85rem; }
        ul.legend .key { display: inline-block; width: 16px; height: 10px; margin-right: 5px; background: var(--key); vertical-align: middle; }
        ul.legend .key.line { height: 3px; }
        ul.legend .key.band { opacity: 0.6; }
        ul.legend .key.period { opacity: 0.7; height: 12px; }
        ul.legend .key.dashed { height: 0; border-top: 3px dashed var(--key); background: none; }
        ul.legend .key.marker { width: 0; height: 14px; border-left: 2px dotted var(--key); background: none; }
        ul.legend .key.ring { width: 11px; height: 11px; border-radius: 50%; border: 2px solid var(--key); background: none; }
        figcaption { font-size: 0.85rem; color: #4a4f55; margin-top: 4px; }
        .runbook dt { font-weight: 600; margin-top: 0.5rem; } .runbook dd { margin-left: 1rem; }
        table.rows { border-collapse: collapse; width: 100%; background: #fff; font-size: 0.9rem; }
        table.rows th, table.rows td { text-align: left; padding: 5px 8px; border-bottom: 1px solid #e6e0d4; vertical-align: top; overflow-wrap: break-word; }
        table.rows td.nowrap { white-space: nowrap; }
        details.more { margin: 0.4rem 0; } details.more summary { cursor: pointer; color: #174d78; }
        table.rows th { background: #ece7dc; font-weight: 600; }
        table.rows td.num { text-align: right; font-variant-numeric: tabular-nums; }
        .muted { color: #6a6f75; }
        @media (max-width: 700px) {
          main { padding: 8px 10px 32px; }
          svg .title { font-size: 24px; } svg .tick { font-size: 20px; } svg .axis-title { font-size: 20px; } svg .xtick.alt { display: none; }
          .sev { min-width: 0; }
          table.rows:not(.small) thead { display: none; }
          table.rows:not(.small), table.rows:not(.small) tbody, table.rows:not(.small) tr, table.rows:not(.small) td { display: block; width: 100%; }
          table.rows:not(.small) tr { border: 1px solid #ddd6c8; border-radius: 6px; margin-bottom: 8px; background: #fff; }
          table.rows:not(.small) td { display: flex; gap: 12px; justify-content: space-between; border-bottom: 1px solid #f0ece3; }
          table.rows:not(.small) td::before { content: attr(data-label); font-weight: 600; color: #4a4f55; flex: 0 0 42%; text-align: left; }
        }
        """;

    /// <summary>The page's head and the start of its body.</summary>
    public static StringBuilder Begin(string title, string? nav = null)
    {
        var html = new StringBuilder();
        html.Append("<!DOCTYPE html><html lang=\"en\"><head><meta charset=\"utf-8\"><meta name=\"viewport\" content=\"width=device-width, initial-scale=1\">");
        html.Append("<meta name=\"referrer\" content=\"no-referrer\">");
        html.Append("<title>").Append(Enc(title)).Append("</title><style>").Append(Style).Append("</style></head><body><main>");
        if (nav is not null)
        {
            html.Append("<nav>").Append(nav).Append("</nav>");
        }

        return html;
    }

    /// <summary>Closes the page.</summary>
    public static string End(StringBuilder html) => html.Append("</main></body></html>\n").ToString();

    /// <summary>A page that only says something: not found, sign-in needed, unavailable.</summary>
    public static string Message(string title, string text)
    {
        StringBuilder html = Begin("ModelWatch: " + title, "<a href=\"/\">fleet</a>");
        html.Append("<h1>").Append(Enc(title)).Append("</h1><p>").Append(Enc(text)).Append("</p>");
        return End(html);
    }

    /// <summary>HTML-escaped text.</summary>
    public static string Enc(string? text) => WebUtility.HtmlEncode(text ?? string.Empty);
}
