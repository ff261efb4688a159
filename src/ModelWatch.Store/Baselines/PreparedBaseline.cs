using ModelWatch.Checks.Summaries;
using ModelWatch.Store.Specs;

namespace ModelWatch.Store.Baselines;

/// <summary>A baseline fitted or imported and checked, not yet stored.</summary>
/// <param name="Spec">The model's spec it was made for.</param>
/// <param name="Reference">The reference statistics.</param>
/// <param name="ReferenceWindow">The reference window read, if any.</param>
public sealed record PreparedBaseline(ModelSpec Spec, BaselineReference Reference, (DateTimeOffset Start, DateTimeOffset End)? ReferenceWindow);
