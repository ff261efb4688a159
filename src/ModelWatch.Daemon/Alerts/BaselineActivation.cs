using System.Globalization;
using Dapper;
using ModelWatch.Daemon.Notifications;
using ModelWatch.Store.Baselines;
using Npgsql;

namespace ModelWatch.Daemon.Alerts;

/// <summary>
/// Changes the baseline a model is watched against — by storing a new version (<c>baseline fit</c>, <c>baseline
/// import</c>) or by choosing a stored one (<c>baseline activate</c>) — and, in the same transaction, supersedes the
/// model's unresolved alerts that were raised against another version: each is resolved with the transition
/// <c>superseded</c>, recorded in <c>modelwatch.alert_event</c> with its notifications queued, and the alert policy's
/// memory of it reset, as a human resolution does. Those alerts compared the data with coefficients the model is no
/// longer judged by, so leaving them open would page on-call about a comparison nobody makes any more. Alerts whose
/// baseline version is unknown (opened before schema 4) count as raised against the version active until now.
/// With <c>keepAlerts</c> they stay open and are only named.
/// </summary>
public sealed class BaselineActivation
{
    private readonly NpgsqlDataSource _state;
    private readonly BaselineRepository _baselines;
    private readonly TimeProvider _time;
    private readonly int _timeoutSeconds;

    /// <summary>Creates the activation over the state database.</summary>
    public BaselineActivation(NpgsqlDataSource state, TimeProvider time, TimeSpan commandTimeout)
    {
        ArgumentNullException.ThrowIfNull(state);
        ArgumentNullException.ThrowIfNull(time);
        _state = state;
        _time = time;
        _timeoutSeconds = (int)Math.Ceiling(commandTimeout.TotalSeconds);
        _baselines = new BaselineRepository(state, time, commandTimeout);
    }

    /// <summary>Stores <paramref name="prepared"/> as the model's next version and makes it the active one.</summary>
    public async Task<ActivationOutcome> StoreAsync(PreparedBaseline prepared, string actor, bool keepAlerts, CancellationToken cancellationToken)
    {
        ArgumentNullException.ThrowIfNull(prepared);
        string modelKey = prepared.Spec.Key;
        await using NpgsqlConnection connection = await _state.OpenConnectionAsync(cancellationToken);
        await using NpgsqlTransaction transaction = await connection.BeginTransactionAsync(cancellationToken);
        BaselineVersions versions = await _baselines.LockModelAsync(connection, transaction, modelKey, cancellationToken)
            ?? throw new BaselineException($"no model '{modelKey}'; apply its spec first ('modelwatch model apply')");
        int version = await _baselines.InsertAsync(connection, transaction, modelKey, prepared.Reference, prepared.ReferenceWindow, actor, cancellationToken);
        ActivationOutcome outcome = await SwitchAsync(connection, transaction, modelKey, versions.Active, version, actor, keepAlerts, cancellationToken);
        await transaction.CommitAsync(cancellationToken);
        return outcome;
    }

    /// <summary>Makes the stored <paramref name="version"/> the one the model is watched against.</summary>
    public async Task<ActivationOutcome> ActivateAsync(string modelKey, int version, string actor, bool keepAlerts, CancellationToken cancellationToken)
    {
        await using NpgsqlConnection connection = await _state.OpenConnectionAsync(cancellationToken);
        await using NpgsqlTransaction transaction = await connection.BeginTransactionAsync(cancellationToken);
        BaselineVersions versions = await _baselines.LockModelAsync(connection, transaction, modelKey, cancellationToken)
            ?? throw new BaselineException($"no model '{modelKey}'");
        if (!versions.Versions.Contains(version))
        {
            throw new BaselineException($"model {modelKey} has no baseline version {version.ToString(CultureInfo.InvariantCulture)} (versions: {versions.Describe()})");
        }

        // A baseline made for another design would only make every run skip: refuse it and say what would fit.
        var designs = await connection.QuerySingleAsync<(string Spec, string Baseline)>(new CommandDefinition(
            """
            SELECT m.design_signature, b.design_signature
              FROM modelwatch.model m JOIN modelwatch.baseline b ON b.model_key = m.key AND b.version = @version
             WHERE m.key = @modelKey
            """,
            new { modelKey, version }, transaction, _timeoutSeconds, cancellationToken: cancellationToken));
        if (designs.Spec != designs.Baseline)
        {
            throw new BaselineException(
                $"model {modelKey}: baseline version {version.ToString(CultureInfo.InvariantCulture)} was made for '{designs.Baseline}' but the spec says '{designs.Spec}'; "
                + "runs would be skipped, so it was not activated (apply the spec it was made for first, or choose another version)");
        }

        ActivationOutcome outcome = await SwitchAsync(connection, transaction, modelKey, versions.Active, version, actor, keepAlerts, cancellationToken);
        await transaction.CommitAsync(cancellationToken);
        return outcome;
    }

    private async Task<ActivationOutcome> SwitchAsync(
        NpgsqlConnection connection, NpgsqlTransaction transaction, string modelKey, int? previous, int version, string actor, bool keepAlerts, CancellationToken cancellationToken)
    {
        CommandDefinition Command(string sql, object args) => new(sql, args, transaction, _timeoutSeconds, cancellationToken: cancellationToken);
        await _baselines.SetActiveAsync(connection, transaction, modelKey, version, cancellationToken);
        List<StaleAlert> stale = [.. await connection.QueryAsync<StaleAlert>(Command(
            """
            SELECT id AS Id, check_name AS CheckName, subject AS Subject, severity AS Severity,
                   COALESCE(baseline_version, @previous) AS RaisedAgainst
              FROM modelwatch.alert
             WHERE model_key = @modelKey AND state <> 'resolved' AND COALESCE(baseline_version, @previous) <> @version
             ORDER BY id
               FOR UPDATE
            """,
            new { modelKey, previous, version }))];
        if (keepAlerts)
        {
            return new ActivationOutcome(modelKey, version, previous, [], [.. stale.Select(a => a.Id)]);
        }

        DateTimeOffset now = _time.GetUtcNow();
        foreach (StaleAlert alert in stale)
        {
            string explanation = string.Create(CultureInfo.InvariantCulture,
                $"superseded: model now watched against baseline {version} (was {alert.RaisedAgainst})");
            await connection.ExecuteAsync(Command(
                "UPDATE modelwatch.alert SET state = 'resolved', resolved_at = @now, resolved_by = @actor WHERE id = @id",
                new { now, actor, id = alert.Id }));
            await connection.ExecuteScalarAsync<long>(Command(
                NotificationQueue.WithQueuedNotifications("""
                    INSERT INTO modelwatch.alert_event (alert_id, transition, severity, state, actor, at, explanation)
                    VALUES (@id, 'superseded', @severity, 'resolved', @actor, @now, @explanation)
                    """),
                new { id = alert.Id, severity = alert.Severity, actor, now, explanation }));

            // As after a human resolution: evidence against the new baseline opens a fresh alert, not this one's memory.
await AlertPolicyMemory.ResetAsync(connection, transaction, _timeoutSeconds, modelKey, alert.CheckName, alert.Subject, now, cancellationToken);
        }

        return new ActivationOutcome(modelKey, version, previous, [.. stale.Select(a => a.Id)], []);
    }

    /// <summary>An unresolved alert raised against a baseline the model is no longer watched against.</summary>
    private sealed class StaleAlert
    {
        public long Id { get; set; }

        public string CheckName { get; set; } = string.Empty;

        public string? Subject { get; set; }

        public string Severity { get; set; } = string.Empty;

        public int? RaisedAgainst { get; set; }
    }
}
