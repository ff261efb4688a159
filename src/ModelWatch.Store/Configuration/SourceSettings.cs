namespace ModelWatch.Store.Configuration;

/// <summary>One data source under <c>Sources:&lt;name&gt;</c> (bound only to audit its keys; the store reads the value directly).</summary>
public sealed class SourceSettings
{
    /// <summary>The source database's connection string.</summary>
    public string? ConnectionString { get; set; }
}
