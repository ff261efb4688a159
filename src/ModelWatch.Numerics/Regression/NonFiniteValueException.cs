namespace ModelWatch.Numerics.Regression;

/// <summary>Raised under <see cref="NonFiniteValuePolicy.Fail"/> when a row holds a NaN or infinite value.</summary>
public sealed class NonFiniteValueException : Exception
{
    /// <summary>Creates the exception for a column and the row number (1-based, in arrival order).</summary>
    public NonFiniteValueException(string column, double value, long row)
        : base($"column '{column}' holds {Describe(value)} in row {row}; non-finite values are never fitted")
    {
        Column = column;
        Row = row;
    }

    /// <summary>Creates the exception with a message.</summary>
    public NonFiniteValueException()
        : this("(unknown)", double.NaN, 0)
    {
    }

    /// <summary>Creates the exception with a message.</summary>
    public NonFiniteValueException(string message)
        : base(message)
    {
        Column = "(unknown)";
    }

    /// <summary>Creates the exception with a message and inner exception.</summary>
    public NonFiniteValueException(string message, Exception innerException)
        : base(message, innerException)
    {
        Column = "(unknown)";
    }

    /// <summary>The column that held the value.</summary>
    public string Column { get; }

    /// <summary>The 1-based row number, counting every row offered to the accumulator.</summary>
    public long Row { get; }

    private static string Describe(double value) =>
        double.IsNaN(value) ? "NaN" : value > 0 ? "+infinity" : "-infinity";
}
