using System.Data;
using ModelWatch.Checks.Summaries;
using ModelWatch.Store.Specs;
using ModelWatch.Store.Windows;
using Npgsql;
using NpgsqlTypes;

namespace ModelWatch.Store.Benchmarks;

/// <summary>The measured variants, each reading the whole table once.</summary>
internal sealed class Runs(NpgsqlDataSource source, long rows)
{
    private readonly ModelSpec _spec = BenchTable.Spec(rows, 1);
    private readonly DateTimeOffset _end = BenchTable.Start.AddSeconds(rows);
    private BaselineReference? _baseline;

    /// <summary>(a) The limit: the same ordered statement, sequential access, each column summed.</summary>
    public async Task<double> BareReadAsync()
    {
        await using NpgsqlConnection connection = await source.OpenConnectionAsync();
        await using NpgsqlTransaction transaction = await connection.BeginTransactionAsync(IsolationLevel.RepeatableRead);
        await using var command = new NpgsqlCommand(ColumnCheck.ReadSql(_spec, []), connection, transaction) { CommandTimeout = 0 };
        command.Parameters.Add(new NpgsqlParameter("window_start", NpgsqlDbType.TimestampTz) { Value = BenchTable.Start.UtcDateTime });
        command.Parameters.Add(new NpgsqlParameter("window_end", NpgsqlDbType.TimestampTz) { Value = _end.UtcDateTime });
        command.Parameters.Add(new NpgsqlParameter("new_from", NpgsqlDbType.TimestampTz) { Value = BenchTable.Start.UtcDateTime });
        var sums = new double[BenchTable.Features + 1];
        await using (NpgsqlDataReader reader = await command.ExecuteReaderAsync(CommandBehavior.SequentialAccess))
        {
            while (await reader.ReadAsync())
            {
                for (int j = 0; j < sums.Length; j++)
                {
                    sums[j] += reader.GetDouble(j);
                }
            }
        }

        await transaction.CommitAsync();
        return sums.Sum();
    }

    /// <summary>(r) The window reader into the bare accumulator: the reader's own cost without the per-window summaries.</summary>
    public async Task<double> AccumulatorReadAsync()
    {
        var result = await new WindowReader().ReadAsync(source, _spec, BenchTable.Start, _end, () => new AccumulatorSink(_spec.Layout), null, CancellationToken.None);
        return result.Sink.Accumulator.RowCount;
    }

    /// <summary>(b) The window read into the summary builder; (c) the same plus the fit and summaries (Build).</summary>
    public async Task<double> SummaryReadAsync(bool build, int parallelReads = 1)
    {
        BaselineReference baseline = await BaselineAsync();
        ModelSpec spec = parallelReads == 1 ? _spec : BenchTable.Spec(rows, parallelReads);
        var options = new WindowSummaryOptions();
        var result = await new WindowReader().ReadAsync(source, spec, BenchTable.Start, _end,
            () => new WindowSummarySink(spec.Layout, baseline, options), WindowSummarySink.Merge, CancellationToken.None);
        if (!build)
        {
            return result.Sink.Builder.RowCount;
        }

        WindowSummary summary = result.Sink.Builder.Build();
        return summary.Fit!.ResidualStandardDeviation;
    }

    /// <summary>A fitted baseline on the first 20,000 rows (built once, outside the timings).</summary>
    public async Task<BaselineReference> BaselineAsync()
    {
        if (_baseline is null)
        {
            var read = await new WindowReader().ReadAsync(source, _spec, BenchTable.Start, BenchTable.Start.AddSeconds(Math.Min(rows, 20_000)),
                () => new BaselineSink(_spec.Layout, new BaselineBuilderOptions()), null, CancellationToken.None);
            _baseline = read.Sink.Builder.Build(BaselineOrigin.Fitted);
        }

        return _baseline;
    }
}
