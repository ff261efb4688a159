using ModelWatch.Store.Specs;

namespace ModelWatch.Cli.Operations;

/// <summary>The slots a backtest runs: the schedule's own slots in [from, to], or every step from <c>from</c> on.</summary>
internal static class BacktestSlots
{
    /// <summary>Most windows one backtest runs; past it, ask for a longer step rather than read for hours.</summary>
    public const int MaximumWindows = 50_000;

    public static IReadOnlyList<DateTimeOffset> Between(string model, Schedule schedule, DateTimeOffset from, DateTimeOffset to, Duration? every)
    {
        ArgumentNullException.ThrowIfNull(schedule);
        var slots = new List<DateTimeOffset>();
        DateTimeOffset? next = every is null && schedule.SlotAtOrBefore(from) != from ? schedule.NextSlotAfter(from) : from;
        while (next is { } slot && slot <= to)
        {
            if (slots.Count == MaximumWindows)
            {
                throw new OperationException($"model {model}: more than {MaximumWindows} windows between {Output.CliJson.Time(from)} and {Output.CliJson.Time(to)}; shorten the period or pass a longer --every");
            }

            slots.Add(slot);
            next = every is { } step ? slot + step.Length : schedule.NextSlotAfter(slot);
        }

        return slots;
    }
}
