namespace ModelWatch.Cli.Commands;

/// <summary>
/// A command was given a model key that is not registered. <see cref="StoreCommandRunner"/> prints
/// "modelwatch &lt;command&gt;: " and the message, and exits with code 3.
/// </summary>
internal sealed class ModelNotFoundException(string key, string? closest)
    : Exception($"no model '{ModelWatch.Cli.Output.TerminalText.Clean(key)}'{(closest is null ? string.Empty : $"; did you mean '{closest}'?")}")
{
    /// <summary>The key as given.</summary>
    public string Key { get; } = key;

    /// <summary>The registered key nearest to <see cref="Key"/>, when one is near enough to be a likely typo.</summary>
    public string? Closest { get; } = closest;
}
