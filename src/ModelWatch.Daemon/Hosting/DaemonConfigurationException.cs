namespace ModelWatch.Daemon.Hosting;

/// <summary>The daemon's configuration has problems; <see cref="Problems"/> lists every one.</summary>
public sealed class DaemonConfigurationException : Exception
{
    /// <summary>Creates the exception.</summary>
    public DaemonConfigurationException(IReadOnlyList<string> problems)
        : base($"{problems?.Count ?? 0} configuration problem(s): " + string.Join("; ", problems ?? []))
    {
        Problems = problems ?? [];
    }

    /// <summary>Every problem found.</summary>
    public IReadOnlyList<string> Problems { get; }
}
