namespace ModelWatch.Store.Models;

/// <summary>What <c>model apply</c> did to one model.</summary>
public enum ApplyAction
{
    /// <summary>A new model was registered.</summary>
    Created,

    /// <summary>The stored spec was replaced.</summary>
    Updated,

    /// <summary>The stored spec was already identical.</summary>
    Unchanged,

    /// <summary>The model's file is gone and <c>--prune</c> disabled it.</summary>
    Disabled,
}

/// <summary>One model's result of an apply, with a note when its current baseline no longer fits the design.</summary>
public sealed record ApplyOutcome(string Key, ApplyAction Action, string? BaselineNote);
