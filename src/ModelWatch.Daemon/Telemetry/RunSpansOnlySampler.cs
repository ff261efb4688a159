using System.Diagnostics;
using OpenTelemetry.Trace;

namespace ModelWatch.Daemon.Telemetry;

/// <summary>
/// Records traces that start in ModelWatch's own spans (a run, its stages and their database calls) and drops
/// database calls that start a trace of their own: the scheduler's polls, claims and housekeeping would otherwise
/// emit several root spans every few seconds while nothing is due. Used as the root sampler of a parent-based
/// sampler, so children follow their run.
/// </summary>
public sealed class RunSpansOnlySampler : Sampler
{
    /// <inheritdoc />
    public override SamplingResult ShouldSample(in SamplingParameters samplingParameters) =>
        samplingParameters.Kind == ActivityKind.Client ? new SamplingResult(SamplingDecision.Drop) : new SamplingResult(SamplingDecision.RecordAndSample);
}
