namespace ModelWatch.Store.Configuration;

/// <summary>A connection string that a command needs is not configured.</summary>
public sealed class StoreConfigurationException : Exception
{
    /// <summary>Creates the exception.</summary>
    public StoreConfigurationException(string message)
        : base(message)
    {
    }
}
