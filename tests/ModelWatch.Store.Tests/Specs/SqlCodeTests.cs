using ModelWatch.Store.Specs;

namespace ModelWatch.Store.Tests.Specs;

/// <summary>Which parts of a statement are code, by PostgreSQL's lexical rules (comments, constants, quoted identifiers).</summary>
public sealed class SqlCodeTests
{
    [Theory]
    [InlineData("SELECT * FROM t WHERE at >= @window_start", true)]
    [InlineData("SELECT * FROM t -- WHERE at >= @window_start", false)]
    [InlineData("SELECT * FROM t /* a /* nested */ @window_start */ WHERE x", false)]
    [InlineData("SELECT '@window_start' FROM t", false)]
    [InlineData("SELECT 'it''s @window_start' FROM t", false)]
    [InlineData("SELECT E'\\' @window_start' FROM t", false)]
    [InlineData("SELECT $$ @window_start $$ FROM t", false)]
    [InlineData("SELECT $q$ it's @window_start $q$ FROM t WHERE a > @window_start", true)]
    [InlineData("SELECT \"@window_start\" FROM t", false)]
    [InlineData("SELECT * FROM t WHERE at >= @window_start_local", false)]
    [InlineData("SELECT * FROM t WHERE at >= @@window_start", false)]
    [InlineData("SELECT a$1$b, @window_start FROM t", true)]
    public void A_parameter_counts_only_in_code(string sql, bool used)
    {
        Assert.Equal(used, SqlCode.Uses(sql, "@window_start"));
    }

    [Fact]
    public void Blanked_parts_keep_every_other_character_in_place()
    {
        const string sql = "SELECT 'a;b' AS x, \"c;d\" -- e;f\nFROM t /* g;h */ WHERE y = $z$;$z$";
        string code = SqlCode.Of(sql);

        Assert.Equal(sql.Length, code.Length);
        Assert.DoesNotContain(';', code);
        Assert.StartsWith("SELECT ", code, StringComparison.Ordinal);
        Assert.Contains("\nFROM t ", code, StringComparison.Ordinal);
        Assert.Contains(" WHERE y = ", code, StringComparison.Ordinal);
    }
}
