using ModelWatch.Cli.Commands;

namespace ModelWatch.Cli.Tests.Terminal;

/// <summary>The nearest registered key offered after a typo.</summary>
public sealed class ModelKeysTests
{
    private static readonly string[] Keys = ["courier-eta", "delivery-time", "laundry-cycles"];

    [Theory]
    [InlineData("delivery-tme", "delivery-time")]
    [InlineData("Delivery-Time", "delivery-time")]
    [InlineData("courier", "courier-eta")]
    [InlineData("laundry-cycle", "laundry-cycles")]
    [InlineData("warehouse-load", null)]
    [InlineData("ab", null)]
    public void The_closest_key_is_offered_only_when_it_is_close(string typed, string? expected) =>
        Assert.Equal(expected, ModelKeys.Closest(typed, Keys));

    // kitten → sitting and flaw → lawn: the textbook examples of Levenshtein's distance (Levenshtein 1966,
    // Soviet Physics Doklady 10(8)), 3 and 2 edits.
    [Theory]
    [InlineData("", "", 0)]
    [InlineData("kitten", "sitting", 3)]
    [InlineData("flaw", "lawn", 2)]
    public void Distance_is_the_levenshtein_distance(string a, string b, int expected) =>
        Assert.Equal(expected, ModelKeys.Distance(a, b));

    [Fact]
    public void The_message_names_the_key_and_the_suggestion()
    {
        Assert.Equal("no model 'delivery-tme'; did you mean 'delivery-time'?", new ModelNotFoundException("delivery-tme", "delivery-time").Message);
        Assert.Equal("no model 'x'", new ModelNotFoundException("x", null).Message);
    }
}
