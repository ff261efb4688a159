namespace ModelWatch.Cli.Reports;

/// <summary>One check's runbook entry.</summary>
/// <param name="Check">The check name.</param>
/// <param name="Meaning">What a finding of this check means.</param>
/// <param name="Confirm">How to confirm it.</param>
/// <param name="Action">What to do.</param>
internal sealed record RunbookHint(string Check, string Meaning, string Confirm, string Action);
