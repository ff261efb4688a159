namespace ModelWatch.Daemon.Alerts;

/// <summary>
/// Who changed something, in one format everywhere (alerts, quiet periods, baselines): <c>kind:name</c>, where the kind
/// is <c>person</c> (someone at the command line: <c>person:alice@ops-laptop</c>, or <c>person:alice</c> from
/// <c>--actor alice</c>), <c>daemon</c> (a replica: <c>daemon:&lt;worker id&gt;</c>) or <c>check</c> (a person's
/// <c>modelwatch check --record</c> run: <c>check:alice@ops-laptop</c>).
/// </summary>
public static class Actors
{
    private const string PersonKind = "person:";
    private const string DaemonKind = "daemon:";
    private const string CheckKind = "check:";

    /// <summary>The person running this process: <c>person:user@host</c>.</summary>
    public static string CurrentPerson => PersonKind + UserAtHost;

    /// <summary>A <c>check --record</c> run by the person running this process; also its lease owner.</summary>
    public static string CheckRun => CheckKind + UserAtHost;

    /// <summary>A person named on the command line; a name that already carries a kind is kept as given.</summary>
    public static string Person(string name)
    {
        ArgumentException.ThrowIfNullOrWhiteSpace(name);
        string trimmed = name.Trim();
        return HasKind(trimmed) ? trimmed : PersonKind + trimmed;
    }

    /// <summary>The actor of runs recorded by <paramref name="worker"/>: a <c>check:</c> worker is its own actor, anything else a daemon replica.</summary>
    public static string OfWorker(string worker)
    {
        ArgumentException.ThrowIfNullOrWhiteSpace(worker);
        return HasKind(worker) ? worker : DaemonKind + worker;
    }

    private static bool HasKind(string name) =>
        name.StartsWith(PersonKind, StringComparison.Ordinal) || name.StartsWith(DaemonKind, StringComparison.Ordinal) || name.StartsWith(CheckKind, StringComparison.Ordinal);

    private static string UserAtHost => $"{Environment.UserName}@{Environment.MachineName}";
}
