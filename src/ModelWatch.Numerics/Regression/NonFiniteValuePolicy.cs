namespace ModelWatch.Numerics.Regression;

/// <summary>What to do with a row that holds a NaN or infinite value. Such values are never folded in.</summary>
public enum NonFiniteValuePolicy
{
    /// <summary>Leave the row out and count it against the column that was not finite.</summary>
    RejectRow,

    /// <summary>Stop with a <see cref="NonFiniteValueException"/> that names the column.</summary>
    Fail,
}
