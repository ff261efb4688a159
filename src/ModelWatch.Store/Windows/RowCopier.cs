using ModelWatch.Store.Specs;
using Npgsql;

namespace ModelWatch.Store.Windows;

/// <summary>
/// Copies one row of the read statement (features, outcome, optional prediction, all float8) into a reused
/// buffer, applies the spec's <c>missing</c> policy, and hands usable rows to the sink. Nothing is allocated per row.
/// </summary>
internal sealed class RowCopier
{
    private readonly ModelSpec _spec;
    private readonly double[] _features;
    private readonly int _outcomeOrdinal;
    private readonly bool _hasPrediction;
    private readonly int _isNewOrdinal;
    private readonly int _epochOrdinal;
    private readonly string[] _nullReasons;
    private readonly string[] _nonFiniteReasons;

    public RowCopier(ModelSpec spec)
    {
        _spec = spec;
        _features = new double[spec.Features.Count];
        _outcomeOrdinal = spec.Features.Count;
        _hasPrediction = spec.PredictionColumn is not null;
        _isNewOrdinal = _outcomeOrdinal + (_hasPrediction ? 2 : 1);
        _epochOrdinal = _isNewOrdinal + 1;
        string[] columns = [.. spec.Features, spec.Outcome];
        _nullReasons = [.. columns.Select(c => $"null:{c}")];
        _nonFiniteReasons = [.. columns.Select(c => $"non_finite:{c}")];
    }

    public long RowsRead { get; private set; }

    public long RowsRejected { get; private set; }

    public Dictionary<string, long> Reasons { get; } = new(StringComparer.Ordinal);

    /// <summary>The newest row's time in epoch seconds (rejected rows included), or NaN before the first row.</summary>
    public double NewestEpoch { get; private set; } = double.NaN;

    /// <summary>The newest row's time, or null.</summary>
    public DateTimeOffset? NewestRowTime => double.IsFinite(NewestEpoch) ? DateTimeOffset.UnixEpoch.AddTicks((long)(NewestEpoch * TimeSpan.TicksPerSecond)) : null;

    public void Offer(NpgsqlDataReader reader, IWindowRowSink sink)
    {
        RowsRead++;
        int bad = -1;
        bool badIsNull = false;
        for (int j = 0; j <= _outcomeOrdinal; j++)
        {
            // Sequential access: each column is read once, in order, even after a bad value.
            double value;
            if (reader.IsDBNull(j))
            {
                value = double.NaN;
                if (bad < 0)
                {
                    (bad, badIsNull) = (j, true);
                }
            }
            else
            {
                value = reader.GetDouble(j);
                if (!double.IsFinite(value) && bad < 0)
                {
                    (bad, badIsNull) = (j, false);
                }
            }

            if (j < _outcomeOrdinal)
            {
                _features[j] = value;
            }
            else if (bad < 0)
            {
                double? served = null;
                if (_hasPrediction && !reader.IsDBNull(j + 1))
                {
                    double p = reader.GetDouble(j + 1);
                    served = double.IsFinite(p) ? p : null;
                }

                bool isNew = reader.IsDBNull(_isNewOrdinal) || reader.GetBoolean(_isNewOrdinal);
                NoteTime(reader);
                sink.AddRow(_features, value, served, isNew);
                return;
            }
        }

        NoteTime(reader);
        Reject(bad, badIsNull);
    }

    private void NoteTime(NpgsqlDataReader reader)
    {
        // Sequential access may skip columns forward; the time is the last one.
        if (!reader.IsDBNull(_epochOrdinal))
        {
            double epoch = reader.GetDouble(_epochOrdinal);
            if (double.IsFinite(epoch) && !(epoch <= NewestEpoch))
            {
                NewestEpoch = epoch;
            }
        }
    }

    private void Reject(int column, bool isNull)
    {
        string name = column < _outcomeOrdinal ? _spec.Features[column] : _spec.Outcome;
        if (_spec.Missing == MissingValuePolicy.Fail)
        {
            string what = isNull ? "NULL" : "a NaN or infinite value";
            throw new WindowReadException(_spec.Key, WindowReadFailure.MissingValue, name,
                $"model {_spec.Key}: column '{name}' holds {what} in row {RowsRead} of the window (missing: fail); filter or fill it in the query, or use missing: skip-row");
        }

        RowsRejected++;
        string reason = isNull ? _nullReasons[column] : _nonFiniteReasons[column];
        Reasons[reason] = Reasons.GetValueOrDefault(reason) + 1;
    }
}
