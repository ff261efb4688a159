using ModelWatch.Checks.Evaluation;

namespace ModelWatch.Daemon.Evidence;

/// <summary>
/// The runbook entries, each owned by its check (<see cref="IModelCheck.Runbook"/>), in the order a run evaluates the
/// checks: <c>explain</c> prints them, the evidence report shows them, and docs/operations.md's runbook repeats them
/// word for word (a test compares them).
/// </summary>
internal static class RunbookHints
{
    /// <summary>Said wherever evidence is shown, because an alert can tempt someone into a costly retrain or rollback.</summary>
    public const string Caution =
        "An alert is statistical evidence, not proof: it says the change is unlikely to be chance and large enough to matter, " +
        "not why it happened. Retraining or rolling back the model is a decision for the model's owner.";

    /// <summary>Runbook entries in the order a run evaluates the checks.</summary>
    public static IReadOnlyList<RunbookEntry> All { get; } = [.. CheckRegistry.All.Select(c => c.Runbook)];

    /// <summary>The entry of a check, or null for an unknown check name.</summary>
    public static RunbookEntry? For(string check) => All.FirstOrDefault(h => h.Check == check);
}
