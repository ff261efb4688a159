using ModelWatch.Daemon.Options;
using ModelWatch.Store.Specs;

namespace ModelWatch.Daemon.Scheduling;

/// <summary>
/// Maps a due slot and the current time to the slot to run, under the missed-slot policy. Slots come from the
/// schedule alone (intervals anchored at the Unix epoch, cron in UTC), so every replica computes the same ones and
/// "exactly once per slot" can be checked against the run table's unique (model, slot) key.
/// </summary>
public static class SlotPlanner
{
    private const int MaximumWalk = 100_000;

    /// <summary>Plans the run of a model whose <paramref name="dueSlot"/> has come.</summary>
    public static SlotPlan Plan(Schedule schedule, DateTimeOffset dueSlot, DateTimeOffset now, MissedSlotPolicy policy, int maxCatchUpSlots)
    {
        ArgumentNullException.ThrowIfNull(schedule);
        List<DateTimeOffset> pending = PendingSlots(schedule, dueSlot, now);
        DateTimeOffset run = policy switch
        {
            MissedSlotPolicy.CatchUp => pending[Math.Max(0, pending.Count - maxCatchUpSlots)],
            _ => pending[^1],
        };
        int passedOver = pending.IndexOf(run);
        DateTimeOffset next = schedule.NextSlotAfter(run) ?? run.AddYears(100);
        return new SlotPlan(run, passedOver, next);
    }

    /// <summary>The first slot due at or after <paramref name="now"/> for a model that has none yet.</summary>
    public static DateTimeOffset FirstSlot(Schedule schedule, DateTimeOffset now)
    {
        ArgumentNullException.ThrowIfNull(schedule);
        return schedule.SlotAtOrBefore(now) is { } current && current == now ? now : schedule.NextSlotAfter(now) ?? now.AddYears(100);
    }

    /// <summary>Slots from the due one to the latest at or before now (the due slot first; at least one element).</summary>
    private static List<DateTimeOffset> PendingSlots(Schedule schedule, DateTimeOffset dueSlot, DateTimeOffset now)
    {
        var slots = new List<DateTimeOffset> { dueSlot };
        if (schedule.Interval is { } interval)
        {
            DateTimeOffset latest = schedule.SlotAtOrBefore(now) ?? dueSlot;
            long count = Math.Min(MaximumWalk, (latest - dueSlot).Ticks / interval.Length.Ticks);
            for (long i = 1; i <= count; i++)
            {
                slots.Add(latest - TimeSpan.FromTicks((count - i) * interval.Length.Ticks));
            }

            return slots;
        }

        for (int i = 0; i < MaximumWalk; i++)
        {
            DateTimeOffset? next = schedule.NextSlotAfter(slots[^1]);
            if (next is not { } n || n > now)
            {
                break;
            }

            slots.Add(n);
        }

        return slots;
    }
}
