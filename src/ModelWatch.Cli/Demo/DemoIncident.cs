namespace ModelWatch.Cli.Demo;

/// <summary>A change planted in the demo's data over <c>[Start, End)</c>, and the check expected to catch it.</summary>
internal sealed record DemoIncident(int Number, string Name, string Check, DateTimeOffset Start, DateTimeOffset End, string Story)
{
    public bool Covers(DateTimeOffset time) => time >= Start && time < End;
}
