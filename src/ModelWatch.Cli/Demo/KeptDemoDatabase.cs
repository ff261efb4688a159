namespace ModelWatch.Cli.Demo;

/// <summary>What <c>demo --stop</c> needs to find a kept cluster again: its binaries, folder, port and server pid.</summary>
internal sealed record KeptDemoDatabase(string BinDirectory, string Root, int Port, int? ProcessId, string ConnectionString);
