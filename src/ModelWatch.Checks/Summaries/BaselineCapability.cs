namespace ModelWatch.Checks.Summaries;

/// <summary>One group of tests and the part of a baseline it needs.</summary>
/// <param name="Tests">The tests, by check (e.g. <c>residuals: shape (Kolmogorov–Smirnov, Anderson–Darling)</c>).</param>
/// <param name="Needs">What of the baseline they need, in words.</param>
/// <param name="Available">Whether this baseline holds it, so the tests run.</param>
/// <param name="FromReferenceRows">True when only reference rows provide it (a fit, or an import with a reference window).</param>
public sealed record BaselineCapability(string Tests, string Needs, bool Available, bool FromReferenceRows);
