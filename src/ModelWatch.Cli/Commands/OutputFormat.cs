namespace ModelWatch.Cli.Commands;

/// <summary>How a command prints its result.</summary>
public enum OutputFormat
{
    /// <summary>Aligned text for people.</summary>
    Table,

    /// <summary>JSON for scripts.</summary>
    Json,
}
