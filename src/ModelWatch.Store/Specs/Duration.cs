using System.Globalization;
using System.Text.RegularExpressions;

namespace ModelWatch.Store.Specs;

/// <summary>
/// A duration written as an integer and a unit: <c>s</c>, <c>m</c>, <c>h</c>, <c>d</c> or <c>w</c>
/// (<c>90s</c>, <c>15m</c>, <c>1h</c>, <c>7d</c>, <c>2w</c>). Keeps the written form so specs print back as written.
/// </summary>
public readonly partial record struct Duration(long Amount, char Unit)
{
    private static readonly TimeSpan MaximumLength = TimeSpan.FromDays(36_525);

    /// <summary>The length of the duration.</summary>
    public TimeSpan Length => Unit switch
    {
        's' => TimeSpan.FromSeconds(Amount),
        'm' => TimeSpan.FromMinutes(Amount),
        'h' => TimeSpan.FromHours(Amount),
        'd' => TimeSpan.FromDays(Amount),
        'w' => TimeSpan.FromDays(7 * Amount),
        _ => throw new InvalidOperationException($"Unknown duration unit '{Unit}'."),
    };

    /// <summary>Parses <c>&lt;integer&gt;&lt;unit&gt;</c>; returns false with a reason otherwise.</summary>
    public static bool TryParse(string? text, out Duration duration, out string error)
    {
        duration = default;
        Match match = Pattern().Match(text ?? string.Empty);
        if (!match.Success)
        {
            error = $"'{text}' is not a duration: write an integer and a unit s, m, h, d or w (90s, 15m, 1h, 7d, 2w)";
            return false;
        }

        long amount = long.Parse(match.Groups[1].Value, NumberStyles.None, CultureInfo.InvariantCulture);
        char unit = match.Groups[2].Value[0];
        long unitSeconds = unit switch { 's' => 1, 'm' => 60, 'h' => 3_600, 'd' => 86_400, _ => 604_800 };
        if (amount > (long)MaximumLength.TotalSeconds / unitSeconds)
        {
            error = $"'{text}' is longer than 100 years";
            return false;
        }

        duration = new Duration(amount, unit);

        error = string.Empty;
        return true;
    }

    /// <inheritdoc />
    public override string ToString() => Amount.ToString(CultureInfo.InvariantCulture) + Unit;

    [GeneratedRegex("^([0-9]{1,9})([smhdw])$")]
    private static partial Regex Pattern();
}
