namespace ModelWatch.Store.Windows;

/// <summary>A window read failed; the message names the model and, where there is one, the column and the reason.</summary>
public sealed class WindowReadException : Exception
{
    /// <summary>Creates the exception.</summary>
    public WindowReadException(string modelKey, WindowReadFailure failure, string? column, string message, Exception? inner = null)
        : base(message, inner)
    {
        ModelKey = modelKey;
        Failure = failure;
        Column = column;
    }

    /// <summary>The model whose window was read.</summary>
    public string ModelKey { get; }

    /// <summary>What went wrong.</summary>
    public WindowReadFailure Failure { get; }

    /// <summary>The column at fault, when there is one.</summary>
    public string? Column { get; }

    /// <summary>The PostgreSQL SQLSTATE, when the database raised the error.</summary>
    public string? SqlState => (InnerException as Npgsql.PostgresException)?.SqlState;
}
