using ModelWatch.Store.Specs;
using Npgsql;

namespace ModelWatch.Store.Windows;

/// <summary>Turns the database's errors into messages that say which model, which column and what to do.</summary>
internal static class WindowErrors
{
    public static WindowReadException FromPostgres(ModelSpec spec, PostgresException ex)
    {
        string where = ex.Position > 0 ? $" at character {ex.Position} of the query" : string.Empty;
        (WindowReadFailure failure, string? column, string message) = ex.SqlState switch
        {
            PostgresErrorCodes.QueryCanceled => (WindowReadFailure.Timeout, (string?)null,
                $"model {spec.Key}: the query was cancelled by the statement timeout (SQLSTATE 57014); make it faster, shorten the window or use parallel_reads"),
            PostgresErrorCodes.ReadOnlySqlTransaction => (WindowReadFailure.ReadOnlyViolation, null,
                $"model {spec.Key}: the query tried to write ({ex.MessageText}; SQLSTATE 25006); window queries run in a read-only transaction and must only read"),
            PostgresErrorCodes.UndefinedColumn => (WindowReadFailure.MissingColumn, ex.ColumnName,
                $"model {spec.Key}: the query refers to a column that does not exist: {ex.MessageText}{where} (SQLSTATE 42703)"),
            PostgresErrorCodes.SyntaxError => (WindowReadFailure.QueryError, null,
                $"model {spec.Key}: the query is not valid SQL: {ex.MessageText}{where} (SQLSTATE 42601)"),
            _ => (WindowReadFailure.QueryError, ex.ColumnName,
                $"model {spec.Key}: the query failed: {ex.MessageText}{where} (SQLSTATE {ex.SqlState})"),
        };
        return new WindowReadException(spec.Key, failure, column, message, ex);
    }
}
