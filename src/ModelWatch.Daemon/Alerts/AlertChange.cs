namespace ModelWatch.Daemon.Alerts;

/// <summary>The outcome of an operator's acknowledge or resolve, with the sentence to print.</summary>
/// <param name="Kind">Changed, already done, or not found.</param>
/// <param name="Message">E.g. <c>alert #12 acknowledged by person:alice</c> or <c>alert #12 already acknowledged by person:bob at …</c>.</param>
public sealed record AlertChange(AlertChangeKind Kind, string Message);
