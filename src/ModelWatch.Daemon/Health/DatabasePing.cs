using Npgsql;

namespace ModelWatch.Daemon.Health;

/// <summary>Whether a database answers a trivial statement within a few seconds, for the readiness checks.</summary>
internal static class DatabasePing
{
    /// <summary>Runs <c>SELECT 1</c>; throws what the connection or the statement threw.</summary>
    public static async Task PingAsync(NpgsqlDataSource database, CancellationToken cancellationToken)
    {
        await using NpgsqlConnection connection = await database.OpenConnectionAsync(cancellationToken);
        await using var command = new NpgsqlCommand("SELECT 1", connection) { CommandTimeout = 5 };
        await command.ExecuteScalarAsync(cancellationToken);
    }
}
