namespace ModelWatch.Cli.Operations;

/// <summary>An expected failure of <c>check</c> or <c>backtest</c> (unknown model, lease held elsewhere): message on stderr, exit code 3.</summary>
internal sealed class OperationException(string message) : Exception(message);
