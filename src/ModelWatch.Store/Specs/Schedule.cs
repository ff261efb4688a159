using Cronos;

namespace ModelWatch.Store.Specs;

/// <summary>
/// When a model runs: every <see cref="Interval"/> (slots anchored at the Unix epoch, so every replica agrees
/// on them), or at the times of a five-field cron expression read in UTC.
/// </summary>
public sealed class Schedule
{
    private readonly CronExpression? _cron;

    private Schedule(string text, Duration? interval, CronExpression? cron)
    {
        Text = text;
        Interval = interval;
        _cron = cron;
    }

    /// <summary>The schedule as written in the spec.</summary>
    public string Text { get; }

    /// <summary>The interval, or null for a cron schedule.</summary>
    public Duration? Interval { get; }

    /// <summary>Parses an interval (<c>1h</c>) or a five-field cron expression (<c>0 6 * * 1-5</c>).</summary>
    public static bool TryParse(string? text, out Schedule? schedule, out string error)
    {
        schedule = null;
        text = text?.Trim() ?? string.Empty;
        if (text.Split(' ', StringSplitOptions.RemoveEmptyEntries).Length == 5)
        {
            try
            {
                schedule = new Schedule(text, null, CronExpression.Parse(text, CronFormat.Standard));
                error = string.Empty;
                return true;
            }
            catch (CronFormatException ex)
            {
                error = $"'{text}' is not a valid five-field cron expression: {ex.Message}";
                return false;
            }
        }

        if (!Duration.TryParse(text, out Duration interval, out _) || interval.Amount == 0)
        {
            error = $"'{text}' is neither a positive interval (15m, 1h, 1d) nor a five-field cron expression (minute hour day-of-month month day-of-week)";
            return false;
        }

        schedule = new Schedule(text, interval, null);
        error = string.Empty;
        return true;
    }

    /// <summary>The latest slot at or before <paramref name="time"/>, or null when a cron schedule has none in the last year.</summary>
    public DateTimeOffset? SlotAtOrBefore(DateTimeOffset time)
    {
        if (Interval is { } interval)
        {
            long ticks = interval.Length.Ticks;
            long sinceEpoch = time.UtcTicks - DateTimeOffset.UnixEpoch.UtcTicks;
            long slot = sinceEpoch - (((sinceEpoch % ticks) + ticks) % ticks);
            return DateTimeOffset.UnixEpoch.AddTicks(slot);
        }

        // Cron has no "previous occurrence": walk forward from a year back and keep the last one found.
        DateTime from = time.UtcDateTime.AddYears(-1);
        DateTime? last = null;
        foreach (DateTime occurrence in _cron!.GetOccurrences(from, time.UtcDateTime, TimeZoneInfo.Utc, fromInclusive: true, toInclusive: true))
        {
            last = occurrence;
        }

        return last is { } l ? new DateTimeOffset(l, TimeSpan.Zero) : null;
    }

    /// <summary>The first slot strictly after <paramref name="time"/>.</summary>
    public DateTimeOffset? NextSlotAfter(DateTimeOffset time)
    {
        if (Interval is { } interval)
        {
            return SlotAtOrBefore(time)!.Value + interval.Length;
        }

        DateTime? next = _cron!.GetNextOccurrence(time.UtcDateTime, TimeZoneInfo.Utc, inclusive: false);
        return next is { } n ? new DateTimeOffset(n, TimeSpan.Zero) : null;
    }

    /// <inheritdoc />
    public override string ToString() => Text;
}
