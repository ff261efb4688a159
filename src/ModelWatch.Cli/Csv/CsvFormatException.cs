namespace ModelWatch.Cli.Csv;

/// <summary>A CSV file that cannot be read as numbers: the message names the file, line and column.</summary>
public sealed class CsvFormatException : Exception
{
    /// <summary>Creates the exception.</summary>
    public CsvFormatException()
    {
    }

    /// <summary>Creates the exception with a message.</summary>
    public CsvFormatException(string message)
        : base(message)
    {
    }

    /// <summary>Creates the exception with a message and cause.</summary>
    public CsvFormatException(string message, Exception innerException)
        : base(message, innerException)
    {
    }
}
