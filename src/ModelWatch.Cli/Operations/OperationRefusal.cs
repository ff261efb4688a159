namespace ModelWatch.Cli.Operations;

/// <summary>
/// A request <c>check</c> will not carry out as asked (a past slot it cannot replay, a slot behind the recorded
/// history): message on stderr naming what to run instead, exit code 2.
/// </summary>
internal sealed class OperationRefusal(string message) : Exception(message);
