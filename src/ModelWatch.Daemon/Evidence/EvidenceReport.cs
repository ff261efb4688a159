using System.Text;
using ModelWatch.Store.Configuration;

namespace ModelWatch.Daemon.Evidence;

/// <summary>
/// The on-call evidence report: one self-contained HTML page (inline SVG charts, no script, no external requests) for
/// an alert or a run, from the model's recent run history. <c>modelwatch explain --html</c> and <c>modelwatch demo</c>
/// write it to a file; the daemon's web pages serve the same page at <c>/alerts/{id}</c>.
/// </summary>
public static class EvidenceReport
{
    private static readonly TimeSpan CommandTimeout = TimeSpan.FromSeconds(60);

    /// <summary>Writes the report of an alert to <paramref name="path"/> and returns the full path written.</summary>
    /// <param name="databases">The state database (and the model's data source, re-read for the residual chart).</param>
    /// <param name="alertId">An alert id.</param>
    /// <param name="path">The HTML file to write; its folder must exist.</param>
    /// <param name="cancellationToken">Cancels the reads.</param>
    /// <exception cref="ArgumentException">No alert has the id.</exception>
    public static async Task<string> WriteAlertAsync(StoreDataSources databases, long alertId, string path, CancellationToken cancellationToken)
    {
        ArgumentNullException.ThrowIfNull(databases);
        ArgumentException.ThrowIfNullOrWhiteSpace(path);
        Evidence evidence = await new EvidenceLoader(databases, CommandTimeout).LoadAlertAsync(alertId, readWindow: true, cancellationToken)
            ?? throw new ArgumentException($"no alert has id {alertId}", nameof(alertId));
        return await WriteAsync(evidence, path, TimeProvider.System, cancellationToken);
    }

    internal static async Task<string> WriteAsync(Evidence evidence, string path, TimeProvider time, CancellationToken cancellationToken)
    {
        string full = Path.GetFullPath(path);
        await File.WriteAllTextAsync(full, EvidenceHtml.Render(evidence, time.GetUtcNow()), new UTF8Encoding(false), cancellationToken);
        return full;
    }
}
