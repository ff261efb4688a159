namespace ModelWatch.Cli;

/// <summary>The documented process exit codes of <c>modelwatch</c>.</summary>
public static class ExitCodes
{
    /// <summary>The command did its job.</summary>
    public const int Ok = 0;

    /// <summary><c>check</c> found something at or above its <c>--fail-on</c> severity.</summary>
    public const int Findings = 1;

    /// <summary>The command line could not be parsed.</summary>
    public const int Usage = 2;

    /// <summary>The command failed at run time (bad input file, database error, ...), or the daemon's configuration has problems.</summary>
    public const int RuntimeError = 3;

    /// <summary>The daemon stopped because of a fault, not because it was asked to (systemd's <c>Restart=on-failure</c> restarts it).</summary>
    public const int DaemonFault = 4;
}
