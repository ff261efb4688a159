using System.Data;
using System.Globalization;
using ModelWatch.Store.Specs;
using Npgsql;
using NpgsqlTypes;

namespace ModelWatch.Store.Windows;

/// <summary>
/// Reads a model's window from its data source straight into a sink, never holding the rows: the spec's
/// query runs in a REPEATABLE READ, READ ONLY transaction with a statement timeout and the caller's token;
/// its result is described first (names and types checked before any row), then streamed through a
/// sequential-access reader ordered by the time column. With <c>parallel_reads</c> = N the window is split
/// into N half-open time sub-ranges read at once on N connections, each into its own sink, merged in order.
/// </summary>
public sealed class WindowReader
{
    private readonly WindowReadOptions _options;

    /// <summary>Creates a reader with the given limits.</summary>
    public WindowReader(WindowReadOptions? options = null) => _options = options ?? new WindowReadOptions();

    /// <summary>
    /// Describes the query over <c>[start, end)</c> without reading rows and returns every missing or mistyped column
    /// (empty when the result fits the spec). SQL errors are thrown as <see cref="WindowReadException"/>.
    /// </summary>
    public async Task<IReadOnlyList<WindowReadException>> ValidateAsync(NpgsqlDataSource source, ModelSpec spec, DateTimeOffset start, DateTimeOffset end, CancellationToken cancellationToken)
    {
        ArgumentNullException.ThrowIfNull(source);
        ArgumentNullException.ThrowIfNull(spec);
        return await Guard(spec, async () =>
        {
            await using NpgsqlConnection connection = await source.OpenConnectionAsync(cancellationToken);
            await using NpgsqlTransaction transaction = await BeginAsync(connection, spec, cancellationToken);
            var problems = await DescribeAsync(connection, transaction, spec, start, end, cancellationToken);
            return problems.Problems.Select(p => new WindowReadException(spec.Key, p.Failure, p.Column, p.Message)).ToList();
        });
    }

    /// <summary>
    /// Reads <c>[start, end)</c> into sinks made by <paramref name="createSink"/> (one per sub-range) and, when the spec asks
    /// for parallel reads, folds them in time order with <paramref name="merge"/> (required then).
    /// </summary>
    public Task<WindowReadResult<TSink>> ReadAsync<TSink>(
        NpgsqlDataSource source, ModelSpec spec, DateTimeOffset start, DateTimeOffset end,
        Func<TSink> createSink, Action<TSink, TSink>? merge, CancellationToken cancellationToken)
        where TSink : IWindowRowSink =>
        ReadAsync(source, spec, start, end, createSink, merge, newRowsFrom: null, cancellationToken);

    /// <summary>
    /// Reads a window as above, marking each row new when its time is at or after <paramref name="newRowsFrom"/>
    /// (null: every row is new), so sequential statistics consume only the rows the previous run did not see.
    /// </summary>
    public async Task<WindowReadResult<TSink>> ReadAsync<TSink>(
        NpgsqlDataSource source, ModelSpec spec, DateTimeOffset start, DateTimeOffset end,
        Func<TSink> createSink, Action<TSink, TSink>? merge, DateTimeOffset? newRowsFrom, CancellationToken cancellationToken)
        where TSink : IWindowRowSink
    {
        DateTimeOffset newFrom = newRowsFrom ?? start;
        ArgumentNullException.ThrowIfNull(source);
        ArgumentNullException.ThrowIfNull(spec);
        ArgumentNullException.ThrowIfNull(createSink);
        if (end <= start)
        {
            throw new ArgumentException($"model {spec.Key}: the window end {end:O} is not after its start {start:O}.", nameof(end));
        }

        int parts = merge is null ? 1 : spec.ParallelReads;
        DateTimeOffset[] bounds = Split(start.ToUniversalTime(), end.ToUniversalTime(), parts);
        if (bounds.Length == 2)
        {
            return await Guard(spec, () => ReadRangeAsync(source, spec, bounds[0], bounds[1], newFrom, createSink(), cancellationToken));
        }

        // One failing sub-range cancels its siblings, and its own error (not their cancellation) is what the caller sees.
        using var siblings = CancellationTokenSource.CreateLinkedTokenSource(cancellationToken);
        var tasks = new Task<WindowReadResult<TSink>>[bounds.Length - 1];

        // Sinks are made here, on the caller's thread, so a factory that records what it made need not be thread-safe.
        TSink[] partSinks = new TSink[tasks.Length];
        for (int i = 0; i < partSinks.Length; i++)
        {
            partSinks[i] = createSink();
        }

        for (int i = 0; i < tasks.Length; i++)
        {
            (DateTimeOffset from, DateTimeOffset to, TSink partSink) = (bounds[i], bounds[i + 1], partSinks[i]);
            tasks[i] = Task.Run(async () =>
            {
                try
                {
                    return await Guard(spec, () => ReadRangeAsync(source, spec, from, to, newFrom, partSink, siblings.Token));
                }
                catch
                {
                    await siblings.CancelAsync();
                    throw;
                }
            }, CancellationToken.None);
        }

        WindowReadResult<TSink>[] results;
        try
        {
            results = await Task.WhenAll(tasks);
        }
        catch (Exception) when (tasks.Select(t => t.Exception?.InnerException).FirstOrDefault(e => e is not null and not OperationCanceledException) is { } first)
        {
            System.Runtime.ExceptionServices.ExceptionDispatchInfo.Throw(first);
            throw;
        }

        TSink sink = results[0].Sink;
        var reasons = new Dictionary<string, long>(StringComparer.Ordinal);
        foreach (WindowReadResult<TSink> part in results)
        {
            if (!ReferenceEquals(part.Sink, sink))
            {
                merge!(sink, part.Sink);
            }

            foreach ((string reason, long count) in part.RejectedReasons)
            {
                reasons[reason] = reasons.GetValueOrDefault(reason) + count;
            }
        }

        return new WindowReadResult<TSink>(sink, bounds[0], bounds[^1], results.Sum(r => r.RowsRead), results.Sum(r => r.RowsRejected), reasons)
        {
            NewestRowTime = results.Select(r => r.NewestRowTime).Max(),
        };
    }

    /// <summary>Throws <see cref="WindowReadFailure.TooFewRows"/> unless the read left at least <c>min_rows</c> usable rows.</summary>
    public static void EnsureMinimumRows<TSink>(ModelSpec spec, WindowReadResult<TSink> result)
    {
        ArgumentNullException.ThrowIfNull(spec);
        ArgumentNullException.ThrowIfNull(result);
        if (result.RowsAccepted < spec.MinRows)
        {
            string rejected = result.RowsRejected == 0 ? string.Empty : " (rejected: " + string.Join(", ", result.RejectedReasons.Select(r => $"{r.Value} {r.Key}")) + ")";
            throw new WindowReadException(spec.Key, WindowReadFailure.TooFewRows, null,
                $"model {spec.Key}: the window [{result.WindowStart:yyyy-MM-ddTHH:mm:ssZ}, {result.WindowEnd:yyyy-MM-ddTHH:mm:ssZ}) has {result.RowsAccepted} usable row(s) of {result.RowsRead} read{rejected}; min_rows is {spec.MinRows}");
        }
    }

    private async Task<WindowReadResult<TSink>> ReadRangeAsync<TSink>(NpgsqlDataSource source, ModelSpec spec, DateTimeOffset start, DateTimeOffset end, DateTimeOffset newFrom, TSink sink, CancellationToken cancellationToken)
        where TSink : IWindowRowSink
    {
        await using NpgsqlConnection connection = await source.OpenConnectionAsync(cancellationToken);
        await using NpgsqlTransaction transaction = await BeginAsync(connection, spec, cancellationToken);
        var described = await DescribeAsync(connection, transaction, spec, start, end, cancellationToken);
        if (described.Problems.Count > 0)
        {
            var first = described.Problems[0];
            throw new WindowReadException(spec.Key, first.Failure, first.Column, string.Join("; ", described.Problems.Select(p => p.Message)));
        }

        var rows = new RowCopier(spec);
        await using (NpgsqlCommand command = Command(connection, transaction, ColumnCheck.ReadSql(spec, described.NeedsCast), start, end, newFrom))
        {
            // The server's statement_timeout and the token bound the read; a client-side timeout would only race them.
            command.CommandTimeout = 0;
            await using NpgsqlDataReader reader = await command.ExecuteReaderAsync(CommandBehavior.SequentialAccess, cancellationToken);
            while (await reader.ReadAsync(cancellationToken))
            {
                rows.Offer(reader, sink);
            }
        }

        await transaction.CommitAsync(cancellationToken);
        return new WindowReadResult<TSink>(sink, start, end, rows.RowsRead, rows.RowsRejected, rows.Reasons) { NewestRowTime = rows.NewestRowTime };
    }

    private async Task<NpgsqlTransaction> BeginAsync(NpgsqlConnection connection, ModelSpec spec, CancellationToken cancellationToken)
    {
        NpgsqlTransaction transaction = await connection.BeginTransactionAsync(IsolationLevel.RepeatableRead, cancellationToken);
        TimeSpan timeout = _options.StatementTimeoutOf?.Invoke(spec.Source) ?? _options.StatementTimeout;
        long ms = Math.Max(1, (long)timeout.TotalMilliseconds);

        // The configured timeout only ever tightens: a stricter statement_timeout set on the role, the database or the
        // connection string (Options=-c statement_timeout=...) stays in force.
        await using var set = new NpgsqlCommand(
            "SET TRANSACTION READ ONLY; " +
            "SELECT set_config('statement_timeout', (CASE WHEN s > 0 AND s < " + ms.ToString(CultureInfo.InvariantCulture) + " THEN s ELSE " + ms.ToString(CultureInfo.InvariantCulture) + " END)::text, true) " +
            "FROM (SELECT setting::bigint AS s FROM pg_settings WHERE name = 'statement_timeout') AS current",
            connection,
            transaction)
        {
            CommandTimeout = (int)Math.Ceiling(_options.CommandTimeout.TotalSeconds),
        };
        await set.ExecuteNonQueryAsync(cancellationToken);
        return transaction;
    }

    private async Task<(List<(string Column, WindowReadFailure Failure, string Message)> Problems, HashSet<string> NeedsCast)> DescribeAsync(
        NpgsqlConnection connection, NpgsqlTransaction transaction, ModelSpec spec, DateTimeOffset start, DateTimeOffset end, CancellationToken cancellationToken)
    {
        await using NpgsqlCommand describe = Command(connection, transaction, spec.Query, start, end);
        describe.CommandTimeout = (int)Math.Ceiling(_options.CommandTimeout.TotalSeconds);
        List<(string Column, WindowReadFailure Failure, string Message)> problems;
        HashSet<string> needsCast;
        await using (NpgsqlDataReader reader = await describe.ExecuteReaderAsync(CommandBehavior.SchemaOnly, cancellationToken))
        {
            problems = ColumnCheck.Check(spec, reader, out needsCast);
        }

        if (spec.Source is null
            && (await QueryPlan.RelationsAsync(connection, transaction, spec.Query, start, end, (int)Math.Ceiling(_options.CommandTimeout.TotalSeconds), cancellationToken))
                .FirstOrDefault(r => r.Schema == "modelwatch") is { Schema: not null } state)
        {
            string relation = $"{state.Schema}.{state.Relation}";
            // A spec without a source reads the state database with the daemon's own role: it must not read ModelWatch's tables.
            throw new WindowReadException(spec.Key, WindowReadFailure.QueryError, null,
                $"model {spec.Key}: the query reads {relation}, ModelWatch's own state; a spec without 'source:' may read other schemas of the state database only. Name a data source with its own read-only role");
        }

        return (problems, needsCast);
    }

    private static NpgsqlCommand Command(NpgsqlConnection connection, NpgsqlTransaction transaction, string sql, DateTimeOffset start, DateTimeOffset end, DateTimeOffset? newFrom = null)
    {
        var command = new NpgsqlCommand(sql, connection, transaction);
        command.Parameters.Add(new NpgsqlParameter("window_start", NpgsqlDbType.TimestampTz) { Value = start.UtcDateTime });
        command.Parameters.Add(new NpgsqlParameter("window_end", NpgsqlDbType.TimestampTz) { Value = end.UtcDateTime });
        if (newFrom is { } from)
        {
            command.Parameters.Add(new NpgsqlParameter("new_from", NpgsqlDbType.TimestampTz) { Value = from.UtcDateTime });
        }

        return command;
    }

    /// <summary>Boundaries of <paramref name="parts"/> equal sub-ranges, on whole microseconds (PostgreSQL's resolution) so they tile exactly.</summary>
    internal static DateTimeOffset[] Split(DateTimeOffset start, DateTimeOffset end, int parts)
    {
        long startMicros = (start - DateTimeOffset.UnixEpoch).Ticks / 10;
        long endMicros = (end - DateTimeOffset.UnixEpoch).Ticks / 10;
        parts = (int)Math.Max(1, Math.Min(parts, endMicros - startMicros));
        var bounds = new DateTimeOffset[parts + 1];
        bounds[0] = start;
        bounds[parts] = end;
        for (int i = 1; i < parts; i++)
        {
            long micros = startMicros + (long)((Int128)(endMicros - startMicros) * i / parts);
            bounds[i] = DateTimeOffset.UnixEpoch.AddTicks(micros * 10);
        }

        return bounds;
    }

    private static async Task<T> Guard<T>(ModelSpec spec, Func<Task<T>> read)
    {
        try
        {
            return await read();
        }
        catch (PostgresException ex)
        {
            throw WindowErrors.FromPostgres(spec, ex);
        }
        catch (NpgsqlException ex) when (ex is not PostgresException && ex.InnerException is not OperationCanceledException)
        {
            throw new WindowReadException(spec.Key, WindowReadFailure.SourceUnavailable, null,
                $"model {spec.Key}: cannot read from data source '{spec.Source ?? "(state database)"}': {ex.Message}", ex);
        }
    }
}
