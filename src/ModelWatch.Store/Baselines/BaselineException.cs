namespace ModelWatch.Store.Baselines;

/// <summary>A baseline could not be fitted, imported or stored; nothing was written.</summary>
public sealed class BaselineException : Exception
{
    /// <summary>Creates the exception.</summary>
    public BaselineException(string message, Exception? inner = null)
        : base(message, inner)
    {
    }
}
