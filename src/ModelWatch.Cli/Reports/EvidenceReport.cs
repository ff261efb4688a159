using System.Text;
using ModelWatch.Store.Configuration;

namespace ModelWatch.Cli.Reports;

/// <summary>
/// The on-call evidence report: one self-contained HTML file (inline SVG charts, no script, no external requests) for
/// an alert or a run, from the model's recent run history. <c>modelwatch explain --html</c> and <c>modelwatch demo</c>
/// write it.
/// </summary>
public static class EvidenceReport
{
    private static readonly TimeSpan CommandTimeout = TimeSpan.FromSeconds(60);

    /// <summary>Writes the report of an alert or a run to <paramref name="path"/> and returns the full path written.</summary>
    /// <param name="databases">The state database (and the model's data source, re-read for the residual chart).</param>
    /// <param name="id">An alert id or a run id.</param>
    /// <param name="path">The HTML file to write; its folder must exist.</param>
    /// <param name="cancellationToken">Cancels the reads.</param>
    /// <exception cref="ArgumentException">No alert or run has the id.</exception>
    public static async Task<string> WriteAsync(StoreDataSources databases, long id, string path, CancellationToken cancellationToken)
    {
        ArgumentNullException.ThrowIfNull(databases);
        ArgumentException.ThrowIfNullOrWhiteSpace(path);
        Evidence evidence = await new EvidenceLoader(databases, CommandTimeout).LoadAsync(id, readWindow: true, cancellationToken)
            ?? throw new ArgumentException($"no alert or run has id {id}", nameof(id));
        return await WriteAsync(evidence, path, cancellationToken);
    }

    internal static async Task<string> WriteAsync(Evidence evidence, string path, CancellationToken cancellationToken)
    {
        string full = Path.GetFullPath(path);
        await File.WriteAllTextAsync(full, EvidenceHtml.Render(evidence, TimeProvider.System.GetUtcNow()), new UTF8Encoding(false), cancellationToken);
        return full;
    }
}
