namespace ModelWatch.Daemon.Alerts;

/// <summary>What a baseline activation did.</summary>
/// <param name="ModelKey">The model.</param>
/// <param name="Version">The baseline version now active.</param>
/// <param name="PreviousVersion">The version active before (null when the model had no baseline).</param>
/// <param name="Superseded">Alerts resolved as <c>superseded</c>, by id.</param>
/// <param name="Kept">Alerts raised against another version that <c>--keep-alerts</c> left open, by id.</param>
public sealed record ActivationOutcome(string ModelKey, int Version, int? PreviousVersion, IReadOnlyList<long> Superseded, IReadOnlyList<long> Kept);
