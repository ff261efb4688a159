namespace ModelWatch.Cli.Demo;

/// <summary>The demo cannot go on; the message says why and what to do.</summary>
internal sealed class DemoException : Exception
{
    public DemoException(string message)
        : base(message)
    {
    }

    public DemoException()
    {
    }

    public DemoException(string message, Exception innerException)
        : base(message, innerException)
    {
    }
}
