namespace ModelWatch.Calibration;

/// <summary>One detection trial: the delay in runs (null when not caught within the cap), whether an alert of the right check named something else first or meanwhile, and the alerts opened before the change (check/subject (statistic)).</summary>
public sealed record DetectionTrial(int Trial, int? Delay, bool Misnamed, IReadOnlyList<string> AlertsBefore);
