namespace ModelWatch.Cli.Demo;

/// <summary>The demo model's finished runs by status.</summary>
internal sealed class RunTally
{
    public int Ok { get; set; }

    public int Skipped { get; set; }

    public int Failed { get; set; }

    public int Total => Ok + Skipped + Failed;
}
