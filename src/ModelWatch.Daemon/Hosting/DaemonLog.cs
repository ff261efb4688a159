using Microsoft.Extensions.Logging;
using ModelWatch.Daemon.Options;

namespace ModelWatch.Daemon.Hosting;

/// <summary>
/// Every log event the daemon writes, with its event id, in one place: operators filter and alert on the ids, and one
/// class keeps the logging source generator's output in a fixed order (it orders several classes differently from one
/// compiler process to the next, which would make two builds of one commit differ).
/// </summary>
internal static partial class DaemonLog
{
    [LoggerMessage(EventId = 1301, Level = LogLevel.Warning, Message = "Model {Model}: lease lost before slot {Slot:O} was recorded; another replica owns it now, nothing was written")]
    internal static partial void LogLeaseLost(ILogger logger, string model, DateTimeOffset slot);

    [LoggerMessage(EventId = 1302, Level = LogLevel.Information, Message = "Model {Model}: slot {Slot:O} was already recorded by another replica")]
    internal static partial void LogAlreadyRecorded(ILogger logger, string model, DateTimeOffset slot);

    [LoggerMessage(EventId = 1303, Level = LogLevel.Information, Message = "Model {Model}: slot {Slot:O} {Status} ({Reason}); {Rows} row(s) read, {Transitions} alert transition(s)")]
    internal static partial void LogRecorded(ILogger logger, string model, DateTimeOffset slot, string status, string reason, long rows, int transitions);

    [LoggerMessage(EventId = 1402, Level = LogLevel.Error, Message = "Spec problem: {Problem} (nothing from the folder was applied)")]
    internal static partial void LogSpecProblem(ILogger logger, string problem);

    [LoggerMessage(EventId = 1403, Level = LogLevel.Warning, Message = "Specs in {Folder} could not be applied: {Problem}")]
    internal static partial void LogSyncFailed(ILogger logger, string folder, string problem);

    [LoggerMessage(EventId = 1404, Level = LogLevel.Error, Message = "Specs:Directory {Folder} does not exist; no specs are synced from it")]
    internal static partial void LogMissingFolder(ILogger logger, string folder);

    [LoggerMessage(EventId = 1001, Level = LogLevel.Information, Message = "Worker {WorkerId} starting with concurrency {Concurrency}")]
    internal static partial void LogStarting(ILogger logger, string workerId, int concurrency);

    [LoggerMessage(EventId = 1003, Level = LogLevel.Warning, Message = "State database unavailable ({Problem}); retrying in {Seconds:F1} s")]
    internal static partial void LogDatabaseUnavailable(ILogger logger, string problem, double seconds);

    [LoggerMessage(EventId = 1004, Level = LogLevel.Information, Message = "Model {Model}: {Count} missed slot(s) from {DueSlot:O} passed over under MissedSlots={Policy}; running slot {Slot:O}")]
    internal static partial void LogPassedOver(ILogger logger, string model, int count, DateTimeOffset dueSlot, DateTimeOffset slot, MissedSlotPolicy policy);

    [LoggerMessage(EventId = 1005, Level = LogLevel.Warning, Message = "Model {Model}: run for slot {Slot:O} abandoned at shutdown, nothing recorded; the next replica to claim the model applies MissedSlots={Policy} to it")]
    internal static partial void LogAbandoned(ILogger logger, string model, DateTimeOffset slot, MissedSlotPolicy policy);

    [LoggerMessage(EventId = 1006, Level = LogLevel.Error, Message = "Model {Model}: run for slot {Slot:O} could not be recorded; the model is claimed again after its lease expires ({Expires:O}) and MissedSlots={Policy} decides whether this slot runs then")]
    internal static partial void LogRunCrashed(ILogger logger, Exception exception, string model, DateTimeOffset slot, DateTimeOffset expires, MissedSlotPolicy policy);

    [LoggerMessage(EventId = 1010, Level = LogLevel.Warning, Message = "Model {Model}: lease lost during the run for slot {Slot:O} (another replica owns the model now); the run stopped, nothing recorded")]
    internal static partial void LogLeaseLostMidRun(ILogger logger, string model, DateTimeOffset slot);

    [LoggerMessage(EventId = 1011, Level = LogLevel.Warning, Message = "Model {Model}: the lease of the run for slot {Slot:O} could not be renewed ({Problem}); trying again")]
    internal static partial void LogRenewFailed(ILogger logger, string model, DateTimeOffset slot, string problem);

    [LoggerMessage(EventId = 1007, Level = LogLevel.Information, Message = "Worker {WorkerId} stopped; {Released} lease(s) released")]
    internal static partial void LogStopped(ILogger logger, string workerId, int released);

    [LoggerMessage(EventId = 1008, Level = LogLevel.Warning, Message = "Leases could not be released at shutdown ({Problem}); they expire by themselves")]
    internal static partial void LogReleaseFailed(ILogger logger, string problem);

    [LoggerMessage(EventId = 1501, Level = LogLevel.Information, Message = "Retention: {Count} run(s) started before {Cutoff:O} pruned with their findings")]
    internal static partial void LogPruned(ILogger logger, long count, DateTimeOffset cutoff);

    [LoggerMessage(EventId = 1502, Level = LogLevel.Warning, Message = "Retention: pruning failed ({Problem}); retrying later")]
    internal static partial void LogPruneFailed(ILogger logger, string problem);

    [LoggerMessage(EventId = 1201, Level = LogLevel.Warning, Message = "Queued notifications could not be dispatched; they stay queued")]
    internal static partial void LogDispatchFailed(ILogger logger, Exception exception);

    [LoggerMessage(EventId = 1202, Level = LogLevel.Information, Message = "Alert {AlertId} ({Model}/{Check}): notification held by quiet period {QuietPeriodId}")]
    internal static partial void LogHeldByQuietPeriod(ILogger logger, long alertId, string model, string check, long quietPeriodId);

    [LoggerMessage(EventId = 1203, Level = LogLevel.Warning, Message = "Notification target {Target} named by model {Model} is not configured under Notifications:Targets")]
    internal static partial void LogUnknownTarget(ILogger logger, string target, string model);

    [LoggerMessage(EventId = 1204, Level = LogLevel.Error, Message = "Target {Target} did not accept alert {AlertId} after {Attempts} attempt(s): {Error}")]
    internal static partial void LogGaveUp(ILogger logger, string target, long alertId, int attempts, string error);

    [LoggerMessage(EventId = 1205, Level = LogLevel.Warning, Message = "Claimed notifications could not be handed back at shutdown ({Problem}); their leases expire by themselves")]
    internal static partial void LogNotificationReleaseFailed(ILogger logger, string problem);

    [LoggerMessage(EventId = 1009, Level = LogLevel.Warning, Message = "Configuration: {Warning}")]
    internal static partial void LogUnknownSetting(ILogger logger, string warning);

    [LoggerMessage(EventId = 1401, Level = LogLevel.Information, Message = "Specs in {Folder}: {Count} file(s) applied ({Outcomes} outcome(s))")]
    internal static partial void LogSynced(ILogger logger, string folder, int count, int outcomes);

    [LoggerMessage(EventId = 1002, Level = LogLevel.Information, Message = "State database at schema version {Version} ({Applied} migration(s) applied)")]
    internal static partial void LogMigrated(ILogger logger, int version, int applied);

    [LoggerMessage(EventId = 1601, Level = LogLevel.Warning, Message = "Web page {Path} could not be read from the state database")]
    internal static partial void LogWebPageFailed(ILogger logger, string path, Exception exception);
}
