namespace ModelWatch.Store.Windows;

/// <summary>Limits of a window read.</summary>
public sealed class WindowReadOptions
{
    /// <summary>Server-side <c>statement_timeout</c> of the query, set with <c>SET LOCAL</c>. Default 10 minutes.</summary>
    public TimeSpan StatementTimeout { get; init; } = TimeSpan.FromMinutes(10);

    /// <summary>Timeout of the short metadata commands around the read. Default 30 seconds.</summary>
    public TimeSpan CommandTimeout { get; init; } = TimeSpan.FromSeconds(30);
}
