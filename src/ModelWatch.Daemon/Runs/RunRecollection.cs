using ModelWatch.Checks.Findings;
using ModelWatch.Checks.Policy;

namespace ModelWatch.Daemon.Runs;

/// <summary>What a run takes over from the runs before it (see <see cref="IRunMemory"/>).</summary>
/// <param name="Checks">The checks' sequential states by check name (a check without one starts fresh).</param>
/// <param name="Policy">The alert policy's states per (check, subject).</param>
/// <param name="LastWindowEnd">End of the window of the model's latest run that read rows, or null before the first.</param>
public sealed record RunRecollection(Dictionary<string, CheckState> Checks, List<AlertPolicyState> Policy, DateTimeOffset? LastWindowEnd);
