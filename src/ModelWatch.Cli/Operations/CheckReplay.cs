using System.Globalization;
using ModelWatch.Cli.Output;
using ModelWatch.Daemon.Runs;
using ModelWatch.Store.Baselines;
using ModelWatch.Store.Models;

namespace ModelWatch.Cli.Operations;

/// <summary>
/// <c>check --at T</c> for a slot before the current one: the slot as it stood then. The live run memory (sequential
/// states, alert-policy states, end of the last window read) belongs to the newest recorded run, so a past slot run
/// from it reads as "no new rows" and judges old rows by today's statistics. Instead the model's slots are replayed
/// exactly as <c>backtest</c> runs them — from the first slot at or after the end of the baseline's reference window
/// up to T's slot, with a fresh in-memory run memory carried from window to window — and the run at T's slot is
/// reported, so it matches <c>backtest KEY --from &lt;reference end&gt; --to T</c> window for window. Nothing is
/// written. Refused (exit code 2, pointing to <c>backtest</c>) when there is nothing to replay from or it would
/// take too long.
/// </summary>
internal static class CheckReplay
{
    /// <summary>
    /// Most windows one <c>check --at</c> replays (83 days of an hourly schedule, about a week of a 5-minute one);
    /// past it, a backtest over the period shows the same windows with a progress bar and all of them listed.
    /// </summary>
    public const int MaximumWindows = 2_000;

    /// <summary>Whether <paramref name="slot"/> lies before the schedule's current slot, so that live memory is not its memory.</summary>
    public static bool IsPast(ModelRecord model, DateTimeOffset slot, DateTimeOffset now) =>
        model.Spec.Schedule.SlotAtOrBefore(now) is { } current && slot < current;

    /// <summary>Replays the model's slots up to <paramref name="slot"/>; returns the run at it and a line that says what was replayed.</summary>
    public static async Task<(RunOutcome Outcome, string Note)> RunAsync(OperationServices services, TextWriter output, ModelRecord model, DateTimeOffset slot, CancellationToken cancellationToken)
    {
        if (model.BaselineProblem is { } problem)
        {
            throw Refusal(model, slot, null, $"the model has no baseline to replay against ({problem})");
        }

        StoredBaseline baseline = await services.Baselines.GetAsync(model.Key, model.BaselineVersion!.Value, cancellationToken)
            ?? throw Refusal(model, slot, null, $"baseline v{model.BaselineVersion} is gone");
        if (baseline.ReferenceWindowEnd is not { } from)
        {
            throw Refusal(model, slot, null, $"baseline v{baseline.Version} records no reference window, so there is no point to replay from");
        }

        if (slot < from)
        {
            throw Refusal(model, slot, null, $"the slot is before the end of baseline v{baseline.Version}'s reference window ({CliJson.Time(from)}), where the replay starts");
        }

        List<DateTimeOffset> slots = Slots(model, from, slot);
        var memory = new InMemoryRunMemory();
        RunOutcome? last = null;
        await Terminal.ProgressAsync(output, $"replay {model.Key}", slots.Count, async advance =>
        {
            for (int i = 0; i < slots.Count; i++)
            {
                RunOutcome outcome = await services.Pipeline.ExecuteAsync(model, slots[i], memory, cancellationToken);
                // Sources with retention delete their oldest rows first: an empty first window means the history the
                // replay needs is gone, and a replay from the middle would carry different sequential statistics.
                if (i == 0 && slots.Count > 1 && outcome.Status != RunStatus.Failed && outcome.RowsRead == 0)
                {
                    throw Refusal(model, slot, from,
                        $"the source returns no rows for the first window of the replay ({CliJson.Time(outcome.WindowStart)} to {CliJson.Time(outcome.WindowEnd)}); the rows before the slot may have been removed");
                }

                memory.Remember(outcome);
                last = outcome;
                advance();
            }
        });

        string note = string.Create(CultureInfo.InvariantCulture,
            $"slot {CliJson.Time(slot)} of model {model.Key} evaluated as it stood then: replayed {slots.Count} window(s) from {CliJson.Time(slots[0])} (the end of baseline v{baseline.Version}'s reference window) with the run memory in process, as backtest does; nothing was written");
        return (last!, note);
    }

    private static List<DateTimeOffset> Slots(ModelRecord model, DateTimeOffset from, DateTimeOffset slot)
    {
        var schedule = model.Spec.Schedule;
        var slots = new List<DateTimeOffset>();
        DateTimeOffset? next = schedule.SlotAtOrBefore(from) == from ? from : schedule.NextSlotAfter(from);
        while (next is { } s && s <= slot)
        {
            if (slots.Count == MaximumWindows)
            {
                throw Refusal(model, slot, from, $"it lies more than {MaximumWindows} windows after the end of the baseline's reference window ({CliJson.Time(from)}), where the replay starts");
            }

            slots.Add(s);
            next = schedule.NextSlotAfter(s);
        }

        return slots;
    }

    private static OperationRefusal Refusal(ModelRecord model, DateTimeOffset slot, DateTimeOffset? from, string reason) =>
        new($"model {model.Key}: check --at cannot evaluate slot {CliJson.Time(slot)} as it stood then: {reason}. " +
            $"Run 'modelwatch backtest {model.Key} --from {(from is { } f ? CliJson.Time(f) : "<first slot>")} --to {CliJson.Time(slot)}' to see the windows up to it.");
}
