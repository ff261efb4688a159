namespace ModelWatch.Store.Configuration;

/// <summary>One data source under <c>Sources:&lt;name&gt;</c> (bound only to audit its keys; the store reads the value directly).</summary>
public sealed class SourceSettings
{
    /// <summary>The source database's connection string.</summary>
    public string? ConnectionString { get; set; }

    /// <summary>The longest a window read may run on this source (never above a stricter role or database setting). Default 10 min.</summary>
    public TimeSpan? StatementTimeout { get; set; }
}
