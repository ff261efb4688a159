using ModelWatch.Store.Specs;
using Npgsql;

namespace ModelWatch.Store.Windows;

/// <summary>
/// What a source role could do beyond reading, checked by <c>model validate</c>: a READ ONLY transaction stops
/// writes to tables, not a superuser, not the server-file roles, not large objects, notifications or advisory locks,
/// and not a role that may write (or owns) the tables it reads. Each finding is a warning that says how to close it
/// (docs/operations.md, "Least-privilege source roles").
/// </summary>
public static class SourceRoleAudit
{
    private static readonly (string Function, string What)[] Functions =
    [
        ("pg_catalog.lo_from_bytea(oid, bytea)", "create large objects in the source database (lo_from_bytea, lo_create, lo_import)"),
        ("pg_catalog.pg_notify(text, text)", "send notifications (pg_notify)"),
        ("pg_catalog.pg_advisory_lock(bigint)", "take advisory locks that other applications may wait on (pg_advisory_lock)"),
    ];

    /// <summary>Warnings about the role <paramref name="source"/> connects as, for the relations <paramref name="spec"/>'s query reads.</summary>
    public static async Task<IReadOnlyList<string>> WarningsAsync(NpgsqlDataSource source, ModelSpec spec, CancellationToken cancellationToken)
    {
        ArgumentNullException.ThrowIfNull(source);
        ArgumentNullException.ThrowIfNull(spec);
        var warnings = new List<string>();
        await using NpgsqlConnection connection = await source.OpenConnectionAsync(cancellationToken);
        string role = (string)(await Scalar(connection, "SELECT current_user::text", cancellationToken))!;
        string where = $"model {spec.Key}: source role '{role}'";
        if ((bool)(await Scalar(connection, "SELECT rolsuper FROM pg_roles WHERE rolname = current_user", cancellationToken))!)
        {
            warnings.Add($"{where} is a superuser: it can read server files (pg_read_file), run programs and change anything a READ ONLY transaction does not cover; use a role with SELECT only");
        }

        foreach (string serverRole in (string[])["pg_read_server_files", "pg_write_server_files", "pg_execute_server_program"])
        {
            if ((bool)(await Scalar(connection, $"SELECT pg_has_role(current_user, '{serverRole}', 'MEMBER')", cancellationToken))!)
            {
                warnings.Add($"{where} is a member of {serverRole}; revoke it");
            }
        }

        foreach ((string function, string what) in Functions)
        {
            if ((bool)(await Scalar(connection, $"SELECT has_function_privilege('{function}', 'EXECUTE')", cancellationToken))!)
            {
                warnings.Add($"{where} can {what} even in a READ ONLY transaction; revoke EXECUTE on it from PUBLIC in the source database");
            }
        }

        // Planning needs parameter values, not meaningful ones: the plan's relations do not depend on them.
        var day = new DateTimeOffset(2000, 1, 1, 0, 0, 0, TimeSpan.Zero);
        foreach ((string schema, string table) in await QueryPlan.RelationsAsync(connection, null, spec.Query, day, day.AddDays(1), 30, cancellationToken))
        {
            await using var privileges = new NpgsqlCommand(
                """
                SELECT pg_has_role(current_user, c.relowner, 'USAGE'),
                       has_table_privilege(current_user, c.oid, 'INSERT, UPDATE, DELETE, TRUNCATE')
                  FROM pg_class c JOIN pg_namespace n ON n.oid = c.relnamespace
                 WHERE n.nspname = @schema AND c.relname = @table
                """,
                connection);
            privileges.Parameters.AddWithValue("schema", schema);
            privileges.Parameters.AddWithValue("table", table);
            await using NpgsqlDataReader reader = await privileges.ExecuteReaderAsync(cancellationToken);
            if (await reader.ReadAsync(cancellationToken))
            {
                if (reader.GetBoolean(0))
                {
                    warnings.Add($"{where} owns {schema}.{table} (or is a member of its owner): an owner can change or drop it; read through a role that only has SELECT");
                }
                else if (reader.GetBoolean(1))
                {
                    warnings.Add($"{where} may write {schema}.{table} (INSERT, UPDATE, DELETE or TRUNCATE); grant SELECT only");
                }
            }
        }

        return warnings;
    }

    private static async Task<object?> Scalar(NpgsqlConnection connection, string sql, CancellationToken cancellationToken)
    {
        await using var command = new NpgsqlCommand(sql, connection);
        return await command.ExecuteScalarAsync(cancellationToken);
    }
}
