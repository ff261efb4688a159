namespace ModelWatch.Checks.Evaluation;

/// <summary>How a setting's text in a model spec is read.</summary>
public enum SettingKind
{
    /// <summary>A finite number, invariant culture (<c>0.2</c>, <c>1e-3</c>).</summary>
    Number,

    /// <summary>A whole number.</summary>
    WholeNumber,

    /// <summary><c>true</c> or <c>false</c> (stored as 1 or 0).</summary>
    Flag,
}
