using System.Globalization;

namespace ModelWatch.Checks.Evaluation;

/// <summary>
/// A setting a model spec may override under <c>checks: { CHECK: { name: value } }</c>: its owner, name, kind,
/// default, allowed range and what it means (with its source). A check declares its own settings; the model-wide
/// settings of the budget and the alert policy (<see cref="Policy.PolicySettings"/>) have no owner and may be written
/// under any check. Values are kept as doubles (flags as 0 or 1).
/// </summary>
public sealed record CheckSetting
{
    /// <summary>The check that owns the setting, or null for a model-wide setting.</summary>
    public string? Check { get; init; }

    /// <summary>The snake_case name written in specs.</summary>
    public required string Name { get; init; }

    /// <summary>How the text is read.</summary>
    public SettingKind Kind { get; init; } = SettingKind.Number;

    /// <summary>The value when a spec does not set it.</summary>
    public required double Default { get; init; }

    /// <summary>Smallest value accepted (inclusive).</summary>
    public double Minimum { get; init; } = double.NegativeInfinity;

    /// <summary>Largest value accepted (inclusive).</summary>
    public double Maximum { get; init; } = double.PositiveInfinity;

    /// <summary>What the setting does and where its default comes from.</summary>
    public required string Description { get; init; }

    /// <summary>The key overrides are stored under: <c>check.name</c>, or the name alone for a model-wide setting.</summary>
    public string Key => Check is null ? Name : Check + "." + Name;

    /// <summary>Reads a spec's text; false with a message naming the expected kind or range when it does not fit.</summary>
    public bool TryParse(string text, out double value, out string error)
    {
        ArgumentNullException.ThrowIfNull(text);
        bool ok;
        switch (Kind)
        {
            case SettingKind.Flag:
                ok = bool.TryParse(text, out bool flag);
                value = flag ? 1.0 : 0.0;
                error = ok ? string.Empty : $"'{text}' is not true or false";
                return ok;
            case SettingKind.WholeNumber:
                ok = int.TryParse(text, NumberStyles.Integer, CultureInfo.InvariantCulture, out int whole);
                value = whole;
                break;
            default:
                ok = double.TryParse(text, NumberStyles.Float, CultureInfo.InvariantCulture, out value) && double.IsFinite(value);
                break;
        }

        if (!ok)
        {
            error = $"'{text}' is not {(Kind == SettingKind.WholeNumber ? "a whole number" : "a finite number")}";
            return false;
        }

        if (value < Minimum || value > Maximum)
        {
            error = string.Create(CultureInfo.InvariantCulture, $"{text} is outside {Minimum:G6}–{Maximum:G6}");
            return false;
        }

        error = string.Empty;
        return true;
    }
}
