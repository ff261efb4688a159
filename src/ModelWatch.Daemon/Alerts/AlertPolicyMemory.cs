using Dapper;
using Npgsql;

namespace ModelWatch.Daemon.Alerts;

/// <summary>
/// The alert policy's stored memory of one (model, check, subject). Closing an alert from outside the policy (a person's
/// resolution, a baseline that supersedes it) must also clear that memory, or the policy would believe the alert still
/// open and never open a new one when the condition returns.
/// </summary>
internal static class AlertPolicyMemory
{
    /// <summary>Forgets the open flag, the recent severities and the ok count, inside the caller's transaction.</summary>
    public static Task ResetAsync(
        NpgsqlConnection connection, NpgsqlTransaction transaction, int timeoutSeconds, string model, string check, string? subject, DateTimeOffset now, CancellationToken cancellationToken) =>
        connection.ExecuteAsync(new CommandDefinition(
            """
            UPDATE modelwatch.alert_policy_state
               SET state = state || '{"open": false, "recent": [], "consecutive_ok": 0}'::jsonb, updated_at = @now
             WHERE model_key = @model AND check_name = @check AND subject IS NOT DISTINCT FROM @subject
            """,
            new { model, check, subject, now },
            transaction,
            timeoutSeconds,
            cancellationToken: cancellationToken));
}
