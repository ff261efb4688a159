namespace ModelWatch.Store.Migrations;

/// <summary>The state database cannot be brought to the schema this build expects; nothing was changed.</summary>
public sealed class MigrationException : Exception
{
    /// <summary>Creates the exception.</summary>
    public MigrationException(string message, Exception? inner = null)
        : base(message, inner)
    {
    }
}
