namespace ModelWatch.Store.Specs;

/// <summary>What a window read does with a row that has a NULL, NaN or infinite feature or outcome.</summary>
public enum MissingValuePolicy
{
    /// <summary>Leave the row out and count it, by column and reason, in the run's rejected rows (<c>skip-row</c>).</summary>
    SkipRow,

    /// <summary>Stop the read with an error naming the model, the column and the row (<c>fail</c>).</summary>
    Fail,
}
