namespace ModelWatch.Numerics.Regression;

/// <summary>
/// A column's values are so large (or its products so large) that a quantity of the fit cannot be held in double
/// precision even after exact power-of-two scaling; the message names the column and what to do.
/// </summary>
public sealed class ColumnScaleException : ArithmeticException
{
    /// <summary>Creates the exception for a column.</summary>
    public ColumnScaleException(string column, string what)
        : base($"column '{column}': {what} does not fit in double precision (about 1.8e308); rescale the column in the query (for example divide it by a power of ten) and fit again")
    {
        Column = column;
    }

    /// <summary>Creates the exception.</summary>
    public ColumnScaleException()
        : this("(unknown)", "a value")
    {
    }

    /// <summary>Creates the exception with a message.</summary>
    public ColumnScaleException(string message)
        : base(message)
    {
        Column = "(unknown)";
    }

    /// <summary>Creates the exception with a message and inner exception.</summary>
    public ColumnScaleException(string message, Exception innerException)
        : base(message, innerException)
    {
        Column = "(unknown)";
    }

    /// <summary>The column.</summary>
    public string Column { get; }
}
