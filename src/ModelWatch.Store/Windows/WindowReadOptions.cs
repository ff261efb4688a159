namespace ModelWatch.Store.Windows;

/// <summary>Limits of a window read.</summary>
public sealed class WindowReadOptions
{
    /// <summary>
    /// Server-side <c>statement_timeout</c> of the query, set with <c>SET LOCAL</c> unless the role or the database sets
    /// a stricter one, which is kept. Default 10 minutes.
    /// </summary>
    public TimeSpan StatementTimeout { get; init; } = TimeSpan.FromMinutes(10);

    /// <summary>A data source's own timeout (<c>Sources:&lt;name&gt;:StatementTimeout</c>), or null for <see cref="StatementTimeout"/>.</summary>
    public Func<string?, TimeSpan?>? StatementTimeoutOf { get; init; }

    /// <summary>Timeout of the short metadata commands around the read. Default 30 seconds.</summary>
    public TimeSpan CommandTimeout { get; init; } = TimeSpan.FromSeconds(30);
}
