using ModelWatch.Checks.Evaluation;
using ModelWatch.Checks.Policy;
using ModelWatch.Store.Specs;

namespace ModelWatch.Daemon.Execution;

/// <summary>
/// Builds a model's <see cref="CheckThresholds"/> from its spec: the cadence and window length from the schedule and
/// window, the minimum rows, and the <c>checks:</c> section as the checks read it (<see cref="CheckSettingsReader"/>:
/// a check's own settings under its name, model-wide settings under any check).
/// </summary>
public static class SpecThresholds
{
    /// <summary>Returns the settings, or throws <see cref="ArgumentException"/> naming the model, the setting and the reason.</summary>
    public static CheckThresholds For(ModelSpec spec, DateTimeOffset now)
    {
        ArgumentNullException.ThrowIfNull(spec);
        return CheckSettingsReader.Read(spec.Checks, Cadence(spec.Schedule, now), spec.Window.Length, spec.MinRows, spec.Key);
    }

    /// <summary>Time between slots: the interval, or for cron the gap between the next two occurrences.</summary>
    public static TimeSpan Cadence(Schedule schedule, DateTimeOffset now)
    {
        ArgumentNullException.ThrowIfNull(schedule);
        if (schedule.Interval is { } interval)
        {
            return interval.Length;
        }

        DateTimeOffset? first = schedule.NextSlotAfter(now);
        DateTimeOffset? second = first is { } f ? schedule.NextSlotAfter(f) : null;
        return first is { } a && second is { } b ? b - a : TimeSpan.FromDays(1);
    }
}
