using ModelWatch.Checks.Findings;

namespace ModelWatch.Checks.Policy;

/// <summary>The policy's decision for one (check, subject), with the evidence behind it and the state to persist.</summary>
public sealed record AlertDecision
{
    /// <summary>The check.</summary>
    public required string Check { get; init; }

    /// <summary>The subject, or null.</summary>
    public string? Subject { get; init; }

    /// <summary>What to do.</summary>
    public required AlertAction Action { get; init; }

    /// <summary>The worst finding of this run for the key (null when every finding was skipped).</summary>
    public Finding? Evidence { get; init; }

    /// <summary>Why, in a line.</summary>
    public required string Reason { get; init; }

    /// <summary>The state to persist for the key.</summary>
    public required AlertPolicyState State { get; init; }
}
