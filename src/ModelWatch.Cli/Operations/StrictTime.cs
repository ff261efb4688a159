using System.Globalization;
using System.Text.RegularExpressions;

namespace ModelWatch.Cli.Operations;

/// <summary>
/// The one time syntax of every option: RFC 3339 with an explicit <c>Z</c> or offset
/// (<c>2026-03-01T00:00:00Z</c>, <c>2026-03-01T06:00:00+02:00</c>, fractions of a second allowed); a date alone
/// (<c>2026-03-01</c>), meaning midnight UTC; <c>now</c>; and a signed offset from now with a unit s, m, h, d or w
/// (<c>-7d</c>, <c>+2h</c>). Nothing else: a time whose reading depends on a locale or a guess (<c>01/12/2026</c>,
/// <c>12:00</c>, <c>Dec 1</c>) is refused. Times run from 1970-01-01 to 9000-01-01, so a window or a schedule computed
/// from them cannot leave the calendar.
/// </summary>
internal static partial class StrictTime
{
    /// <summary>The earliest time accepted.</summary>
    public static readonly DateTimeOffset Earliest = DateTimeOffset.UnixEpoch;

    /// <summary>The first time no longer accepted.</summary>
    public static readonly DateTimeOffset Latest = new(9000, 1, 1, 0, 0, 0, TimeSpan.Zero);

    /// <summary>What an error message shows as accepted forms.</summary>
    public const string Examples = "2026-03-01T00:00:00Z, 2026-03-01T06:00:00+02:00, 2026-03-01 (midnight UTC), now, -7d or +2h";

    /// <summary>Reads <paramref name="text"/>; false with a message when it is not one of the accepted forms or out of range.</summary>
    public static bool TryParse(string text, DateTimeOffset now, out DateTimeOffset value, out string error)
    {
        value = default;
        string trimmed = (text ?? string.Empty).Trim();
        DateTimeOffset? parsed = trimmed == "now" ? now : Relative(trimmed, now) ?? Absolute(trimmed);
        if (parsed is not { } time)
        {
            error = $"'{text}' is not a time; use RFC 3339 with a Z or an offset, or one of {Examples}";
            return false;
        }

        if (time < Earliest || time >= Latest)
        {
            error = $"'{text}' is out of range: times run from 1970-01-01 to 9000-01-01";
            return false;
        }

        value = time.ToUniversalTime();
        error = string.Empty;
        return true;
    }

    private static DateTimeOffset? Relative(string text, DateTimeOffset now)
    {
        Match match = RelativePattern().Match(text);
        if (!match.Success || !long.TryParse(match.Groups["amount"].Value, NumberStyles.None, CultureInfo.InvariantCulture, out long amount) || amount > 1_000_000)
        {
            return null;
        }

        TimeSpan unit = match.Groups["unit"].Value switch
        {
            "s" => TimeSpan.FromSeconds(1),
            "m" => TimeSpan.FromMinutes(1),
            "h" => TimeSpan.FromHours(1),
            "d" => TimeSpan.FromDays(1),
            _ => TimeSpan.FromDays(7),
        };
        double ticks = (match.Groups["sign"].Value == "-" ? -1.0 : 1.0) * amount * unit.Ticks;
        double target = now.UtcTicks + ticks;
        return target < DateTimeOffset.MinValue.UtcTicks || target > DateTimeOffset.MaxValue.UtcTicks ? DateTimeOffset.MinValue : now.AddTicks((long)ticks);
    }

    private static DateTimeOffset? Absolute(string text)
    {
        Match match = Rfc3339Pattern().Match(text);
        if (!match.Success)
        {
            return null;
        }

        int Number(string group) => int.Parse(match.Groups[group].Value, NumberStyles.None, CultureInfo.InvariantCulture);
        try
        {
            TimeSpan offset = TimeSpan.Zero;
            if (match.Groups["offset"].Success && match.Groups["offset"].Value is not ("Z" or "z"))
            {
                string o = match.Groups["offset"].Value;
                int hours = int.Parse(o.AsSpan(1, 2), NumberStyles.None, CultureInfo.InvariantCulture);
                int minutes = int.Parse(o.AsSpan(4, 2), NumberStyles.None, CultureInfo.InvariantCulture);
                if (hours > 23 || minutes > 59)
                {
                    return null;
                }

                offset = new TimeSpan(hours, minutes, 0) * (o[0] == '-' ? -1 : 1);
            }

            var time = new DateTimeOffset(Number("year"), Number("month"), Number("day"), 0, 0, 0, offset);
            if (match.Groups["hour"].Success)
            {
                if (!match.Groups["offset"].Success)
                {
                    return null;
                }

                time = new DateTimeOffset(Number("year"), Number("month"), Number("day"), Number("hour"), Number("minute"), Number("second"), offset);
                if (match.Groups["fraction"].Success)
                {
                    string digits = match.Groups["fraction"].Value.PadRight(7, '0')[..7];
                    time = time.AddTicks(long.Parse(digits, NumberStyles.None, CultureInfo.InvariantCulture));
                }
            }

            return time;
        }
        catch (ArgumentOutOfRangeException)
        {
            // A month 13, a 30 February, an hour 24: not a time.
            return null;
        }
    }

    [GeneratedRegex(@"^(?<year>\d{4})-(?<month>\d{2})-(?<day>\d{2})(?:[Tt](?<hour>\d{2}):(?<minute>\d{2}):(?<second>\d{2})(?:\.(?<fraction>\d{1,9}))?(?<offset>[Zz]|[+-]\d{2}:\d{2})?)?$", RegexOptions.CultureInvariant)]
    private static partial Regex Rfc3339Pattern();

    [GeneratedRegex(@"^(?:now)?(?<sign>[+-])(?<amount>\d{1,7})(?<unit>[smhdw])$", RegexOptions.CultureInvariant)]
    private static partial Regex RelativePattern();
}
