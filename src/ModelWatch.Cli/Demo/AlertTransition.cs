namespace ModelWatch.Cli.Demo;

/// <summary>One row of the alert history as the demo prints it.</summary>
internal sealed class AlertTransition
{
    public long EventId { get; set; }

    public long AlertId { get; set; }

    public string Transition { get; set; } = string.Empty;

    public string Severity { get; set; } = string.Empty;

    public string Check { get; set; } = string.Empty;

    public string? Subject { get; set; }

    public DateTime At { get; set; }

    public string Explanation { get; set; } = string.Empty;
}
