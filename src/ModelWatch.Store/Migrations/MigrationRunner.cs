using System.Globalization;
using System.Reflection;
using System.Security.Cryptography;
using System.Text;
using System.Text.RegularExpressions;
using Dapper;
using Npgsql;

namespace ModelWatch.Store.Migrations;

/// <summary>
/// Applies the embedded SQL scripts in version order. The whole run is one transaction that first takes a
/// transaction-level advisory lock, so two replicas starting together serialise, the second finds the work
/// done, and a failing script leaves the database exactly as it was. Applied scripts are recorded with a
/// checksum; an edited, already-applied script stops the run.
/// </summary>
public static partial class MigrationRunner
{
    /// <summary>The advisory lock key shared by every migrator (ASCII "mwmigrat").</summary>
    public const long AdvisoryLockKey = 0x6d776d6967726174;

    private const string ResourcePrefix = "ModelWatch.Store.Migrations.";

    /// <summary>The schema version this build expects.</summary>
    public static int LatestVersion => Scripts.Value[^1].Version;

    private static readonly Lazy<List<Migration>> Scripts = new(LoadScripts);

    /// <summary>Brings the state database up to <see cref="LatestVersion"/>.</summary>
    public static async Task<MigrationResult> MigrateAsync(NpgsqlDataSource state, TimeSpan commandTimeout, CancellationToken cancellationToken)
    {
        ArgumentNullException.ThrowIfNull(state);
        int timeout = (int)Math.Ceiling(commandTimeout.TotalSeconds);
        await using NpgsqlConnection connection = await state.OpenConnectionAsync(cancellationToken);
        await using NpgsqlTransaction transaction = await connection.BeginTransactionAsync(cancellationToken);
        CommandDefinition Command(string sql, object? args = null) => new(sql, args, transaction, timeout, cancellationToken: cancellationToken);

        await connection.ExecuteAsync(Command("SELECT pg_advisory_xact_lock(@key)", new { key = AdvisoryLockKey }));
        await connection.ExecuteAsync(Command(
            "CREATE SCHEMA IF NOT EXISTS modelwatch; " +
            "CREATE TABLE IF NOT EXISTS modelwatch.schema_version (version integer PRIMARY KEY, name text NOT NULL, checksum text NOT NULL, applied_at timestamptz NOT NULL DEFAULT now())"));
        var recorded = (await connection.QueryAsync<(int Version, string Checksum)>(Command("SELECT version, checksum FROM modelwatch.schema_version ORDER BY version")))
            .ToDictionary(r => r.Version, r => r.Checksum);

        var applied = new List<int>();
        foreach (Migration migration in Scripts.Value)
        {
            if (recorded.TryGetValue(migration.Version, out string? checksum))
            {
                if (checksum != migration.Checksum)
                {
                    throw new MigrationException($"migration {migration.Version:D4}_{migration.Name} was changed after it was applied (checksum {checksum} in the database, {migration.Checksum} in this build); write a new migration instead");
                }

                continue;
            }

            try
            {
                await connection.ExecuteAsync(Command(migration.Sql));
            }
            catch (PostgresException ex)
            {
                throw new MigrationException($"migration {migration.Version:D4}_{migration.Name} failed ({ex.SqlState}: {ex.MessageText}); nothing was applied", ex);
            }

            await connection.ExecuteAsync(Command(
                "INSERT INTO modelwatch.schema_version (version, name, checksum) VALUES (@Version, @Name, @Checksum)",
                new { migration.Version, migration.Name, migration.Checksum }));
            applied.Add(migration.Version);
        }

        int newest = recorded.Keys.Concat(applied).DefaultIfEmpty(0).Max();
        if (newest > LatestVersion)
        {
            throw new MigrationException($"the state database is at schema version {newest}, newer than this build's {LatestVersion}; upgrade modelwatch");
        }

        await transaction.CommitAsync(cancellationToken);
        return new MigrationResult(applied, newest);
    }

    /// <summary>
    /// Refuses a state database whose schema is not the one this build was made for, before a command reads or writes
    /// it: a newer schema (written by a newer build) must not be changed by this one, and an older one must be migrated
    /// first. Returns the version when it matches.
    /// </summary>
    /// <exception cref="MigrationException">The versions differ (the message names both and what to do).</exception>
    public static async Task<int> EnsureCurrentAsync(NpgsqlDataSource state, TimeSpan commandTimeout, CancellationToken cancellationToken)
    {
        ArgumentNullException.ThrowIfNull(state);
        await using NpgsqlConnection connection = await state.OpenConnectionAsync(cancellationToken);
        int? version = await connection.ExecuteScalarAsync<int?>(new CommandDefinition(
            "SELECT CASE WHEN to_regclass('modelwatch.schema_version') IS NULL THEN NULL ELSE (SELECT coalesce(max(version), 0) FROM modelwatch.schema_version) END",
            commandTimeout: (int)Math.Ceiling(commandTimeout.TotalSeconds),
            cancellationToken: cancellationToken));
        return version switch
        {
            null => throw new MigrationException("the state database has no ModelWatch schema; run 'modelwatch migrate' first"),
            { } v when v > LatestVersion => throw new MigrationException(
                $"the state database is at schema version {v}, newer than this build's {LatestVersion}: this build must not change it; upgrade modelwatch (nothing was read or written)"),
            { } v when v < LatestVersion => throw new MigrationException(
                $"the state database is at schema version {v}, older than this build's {LatestVersion}; run 'modelwatch migrate' (or start a daemon with Daemon:MigrateOnStart) first"),
            { } v => v,
        };
    }

    private static List<Migration> LoadScripts()
    {
        Assembly assembly = typeof(MigrationRunner).Assembly;
        var scripts = new List<Migration>();
        foreach (string resource in assembly.GetManifestResourceNames().Where(n => n.StartsWith(ResourcePrefix, StringComparison.Ordinal)))
        {
            Match match = ScriptName().Match(resource[ResourcePrefix.Length..]);
            if (!match.Success)
            {
                throw new InvalidOperationException($"Embedded migration '{resource}' is not named NNNN_name.sql.");
            }

            using Stream stream = assembly.GetManifestResourceStream(resource)!;
            using var reader = new StreamReader(stream, Encoding.UTF8);
            string sql = reader.ReadToEnd().Replace("\r\n", "\n", StringComparison.Ordinal);
            string checksum = Convert.ToHexStringLower(SHA256.HashData(Encoding.UTF8.GetBytes(sql)));
            scripts.Add(new Migration(int.Parse(match.Groups[1].Value, CultureInfo.InvariantCulture), match.Groups[2].Value, sql, checksum));
        }

        scripts.Sort((a, b) => a.Version.CompareTo(b.Version));
        for (int i = 0; i < scripts.Count; i++)
        {
            if (scripts[i].Version != i + 1)
            {
                throw new InvalidOperationException($"Embedded migrations must be numbered 1, 2, 3, ... without gaps; found {scripts[i].Version} at position {i + 1}.");
            }
        }

        return scripts;
    }

    [GeneratedRegex(@"^(\d{4})_([a-z0-9_]+)\.sql$")]
    private static partial Regex ScriptName();
}
