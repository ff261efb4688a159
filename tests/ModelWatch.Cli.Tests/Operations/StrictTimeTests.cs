using ModelWatch.Cli.Operations;

namespace ModelWatch.Cli.Tests.Operations;

public sealed class StrictTimeTests
{
    private static readonly DateTimeOffset Now = new(2026, 12, 2, 15, 30, 0, TimeSpan.Zero);

    [Theory]
    [InlineData("2026-03-01T00:00:00Z", "2026-03-01T00:00:00.0000000+00:00")]
    [InlineData("2026-03-01t06:00:00+02:00", "2026-03-01T04:00:00.0000000+00:00")]
    [InlineData("2026-03-01T06:00:00.25-01:30", "2026-03-01T07:30:00.2500000+00:00")]
    [InlineData("2026-03-01", "2026-03-01T00:00:00.0000000+00:00")]
    [InlineData("now", "2026-12-02T15:30:00.0000000+00:00")]
    [InlineData("-7d", "2026-11-25T15:30:00.0000000+00:00")]
    [InlineData("+2h", "2026-12-02T17:30:00.0000000+00:00")]
    [InlineData("now-90m", "2026-12-02T14:00:00.0000000+00:00")]
    [InlineData("-1w", "2026-11-25T15:30:00.0000000+00:00")]
    public void The_documented_forms_are_read_in_utc(string text, string expected)
    {
        Assert.True(StrictTime.TryParse(text, Now, out DateTimeOffset value, out string error), error);
        Assert.Equal(expected, value.ToString("O", System.Globalization.CultureInfo.InvariantCulture));
    }

    [Theory]
    [InlineData("01/12/2026")]
    [InlineData("1/2")]
    [InlineData("12:00")]
    [InlineData("Dec 1")]
    [InlineData("2026-03-01T00:00:00")]
    [InlineData("2026-03-01 00:00:00Z")]
    [InlineData("2026-02-30")]
    [InlineData("2026-13-01T00:00:00Z")]
    [InlineData("2026-03-01T24:00:00Z")]
    [InlineData("2026-03-01T00:00:00+25:00")]
    [InlineData("yesterday")]
    [InlineData("-7")]
    [InlineData("")]
    public void Anything_else_is_refused_with_the_accepted_forms(string text)
    {
        Assert.False(StrictTime.TryParse(text, Now, out _, out string error));
        Assert.Contains("is not a time; use RFC 3339 with a Z or an offset, or one of 2026-03-01T00:00:00Z", error, StringComparison.Ordinal);
    }

    [Theory]
    [InlineData("0001-01-01T00:00:00Z")]
    [InlineData("1969-12-31T23:59:59Z")]
    [InlineData("9999-12-31T00:00:00Z")]
    [InlineData("-999999w")]
    public void Times_outside_1970_to_9000_are_out_of_range(string text)
    {
        Assert.False(StrictTime.TryParse(text, Now, out _, out string error));
        Assert.Contains("is out of range: times run from 1970-01-01 to 9000-01-01", error, StringComparison.Ordinal);
    }

    [Theory]
    [InlineData("baseline", "fit", "any-model", "--from", "01/12/2026", "--to", "2026-12-02T00:00:00Z")]
    [InlineData("check", "any-model", "--at", "0001-01-01T00:00:00Z")]
    [InlineData("backtest", "any-model", "--from", "2026-01-01T00:00:00Z", "--to", "9999-12-01T00:00:00Z")]
    [InlineData("quiet", "any-model", "--until", "Dec 1", "--reason", "maintenance")]
    [InlineData("alerts", "resend", "--since", "12:00")]
    public async Task Every_time_option_is_a_usage_error_before_anything_is_opened(params string[] args)
    {
        CliRun run = await CliRun.InvokeAsync(args);

        Assert.Equal(ExitCodes.Usage, run.ExitCode);
        Assert.Matches("--(from|at|to|until|since): '[^']*' is (not a time|out of range)", run.Error);
    }
}
