namespace ModelWatch.Checks.Evaluation;

/// <summary>A check's runbook entry: what an alert means, how to confirm it, what to do next.</summary>
/// <param name="Check">The check.</param>
/// <param name="Meaning">What the alert says about the model.</param>
/// <param name="Confirm">How an on-call engineer confirms it.</param>
/// <param name="Act">What to do next, and who decides.</param>
public sealed record RunbookEntry(string Check, string Meaning, string Confirm, string Act);
