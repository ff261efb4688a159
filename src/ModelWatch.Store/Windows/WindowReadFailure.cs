namespace ModelWatch.Store.Windows;

/// <summary>Why a window read stopped.</summary>
public enum WindowReadFailure
{
    /// <summary>A column the spec names is not in the query's result.</summary>
    MissingColumn,

    /// <summary>A column has a type that cannot be read as a number (or, for the time column, as a time).</summary>
    ColumnType,

    /// <summary>A NULL, NaN or infinite value under <c>missing: fail</c>.</summary>
    MissingValue,

    /// <summary>Fewer usable rows than <c>min_rows</c>.</summary>
    TooFewRows,

    /// <summary>The query ran past the statement timeout (SQLSTATE 57014).</summary>
    Timeout,

    /// <summary>The query tried to write; windows are read in a read-only transaction (SQLSTATE 25006).</summary>
    ReadOnlyViolation,

    /// <summary>The query is not valid SQL or failed in the database.</summary>
    QueryError,

    /// <summary>The data source could not be reached.</summary>
    SourceUnavailable,
}
