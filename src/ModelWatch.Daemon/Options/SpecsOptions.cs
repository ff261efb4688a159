namespace ModelWatch.Daemon.Options;

/// <summary>A folder of model specs kept in sync with the state database (configuration section <c>Specs</c>).</summary>
public sealed class SpecsOptions
{
    /// <summary>The configuration section.</summary>
    public const string Section = "Specs";

    /// <summary>Folder of <c>*.yaml</c> specs, applied at start and whenever a file changes. Default: none (specs are applied with <c>modelwatch model apply</c>).</summary>
    public string? Directory { get; set; }

    /// <summary>Disable registered models whose file is gone from the folder. Default true: the folder is the source of truth.</summary>
    public bool Prune { get; set; } = true;
}
