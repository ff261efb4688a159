using ModelWatch.Store.Specs;
using ModelWatch.Store.Tests.Support;

namespace ModelWatch.Store.Tests.Specs;

public sealed class ModelSpecValidatorTests
{
    private const string Full = """
        key: bakery-demand
        description: Loaves sold per hour at an invented bakery
        source: shop
        query: SELECT sold_at, temperature, promo, loaves, forecast FROM sales WHERE sold_at >= @window_start AND sold_at < @window_end;
        time_column: sold_at
        outcome: loaves
        features:
          - temperature
          - promo
        intercept: false
        schedule: "*/15 * * * *"
        window: 7d
        min_rows: 200
        missing: fail
        checks:
          coefficients: { drift_impact_floor: 0.2, warning_alerts: true }
        notify: [bakery-oncall]
        label_delay: 6h
        prediction_column: forecast
        enabled: false
        parallel_reads: 4
        """;

    [Fact]
    public void A_complete_spec_keeps_every_field()
    {
        ModelSpec spec = StoreTestData.Spec(Full);

        Assert.Equal("bakery-demand", spec.Key);
        Assert.Equal("shop", spec.Source);
        Assert.EndsWith("@window_end", spec.Query, StringComparison.Ordinal);
        Assert.Equal("sold_at", spec.TimeColumn);
        Assert.Equal("loaves", spec.Outcome);
        Assert.Equal(["temperature", "promo"], spec.Features);
        Assert.False(spec.Intercept);
        Assert.Null(spec.Schedule.Interval);
        Assert.Equal(TimeSpan.FromDays(7), spec.Window.Length);
        Assert.Equal(200, spec.MinRows);
        Assert.Equal(MissingValuePolicy.Fail, spec.Missing);
        Assert.Equal("0.2", spec.Checks["coefficients"]["drift_impact_floor"]);
        Assert.Equal(["bakery-oncall"], spec.Notify);
        Assert.Equal(TimeSpan.FromHours(6), spec.LabelDelay.Length);
        Assert.Equal("forecast", spec.PredictionColumn);
        Assert.False(spec.Enabled);
        Assert.Equal(4, spec.ParallelReads);
        Assert.Equal("loaves ~ temperature + promo", spec.DesignSignature);
    }

    [Fact]
    public void Defaults_are_filled_in_and_survive_the_stored_json()
    {
        ModelSpec spec = StoreTestData.Spec("""
            key: courier-minutes
            query: SELECT * FROM d WHERE at >= @window_start AND at < @window_end
            time_column: at
            outcome: minutes
            features: [distance_km]
            schedule: 1h
            window: 24h
            """);

        ModelSpec stored = ModelSpecValidator.FromStoredJson(spec.ToJson());

        Assert.True(stored.Intercept);
        Assert.Equal(30, stored.MinRows);
        Assert.Equal(MissingValuePolicy.SkipRow, stored.Missing);
        Assert.True(stored.Enabled);
        Assert.Equal(1, stored.ParallelReads);
        Assert.Equal(TimeSpan.Zero, stored.LabelDelay.Length);
        Assert.Null(stored.Source);
        Assert.Equal(spec.Sha256(), stored.Sha256());
    }

    [Fact]
    public void An_outcome_may_name_its_unit_which_is_stored_and_changes_neither_the_design_nor_an_older_specs_hash()
    {
        ModelSpec plain = StoreTestData.Spec(Full);
        ModelSpec withUnit = StoreTestData.Spec(Replace(Full, "outcome", "outcome: { column: loaves, unit: loaves per hour }"));

        ModelSpec stored = ModelSpecValidator.FromStoredJson(withUnit.ToJson());

        Assert.Null(plain.OutcomeUnit);
        Assert.DoesNotContain("outcome_unit", plain.ToJson(), StringComparison.Ordinal);
        Assert.Equal("loaves", withUnit.Outcome);
        Assert.Equal("loaves per hour", withUnit.OutcomeUnit);
        Assert.Equal("loaves per hour", stored.OutcomeUnit);
        Assert.Equal(plain.DesignSignature, withUnit.DesignSignature);
        Assert.Equal(withUnit.Sha256(), stored.Sha256());
    }

    [Fact]
    public void The_window_of_a_slot_ends_label_delay_before_it()
    {
        ModelSpec spec = StoreTestData.Spec(Full);

        (DateTimeOffset start, DateTimeOffset end) = spec.WindowForSlot(new DateTimeOffset(2026, 3, 10, 12, 0, 0, TimeSpan.FromHours(2)));

        Assert.Equal(new DateTimeOffset(2026, 3, 10, 4, 0, 0, TimeSpan.Zero), end);
        Assert.Equal(end.AddDays(-7), start);
    }

    [Theory]
    [InlineData("key: Bakery_Demand", "key", "lowercase")]
    [InlineData("window: -3d", "window", "positive duration")]
    [InlineData("window: 0h", "window", "positive duration")]
    [InlineData("window: 3 days", "window", "positive duration")]
    [InlineData("schedule: every hour", "schedule", "cron")]
    [InlineData("schedule: '61 * * * *'", "schedule", "cron")]
    [InlineData("min_rows: 2", "min_rows", "must be more than")]
    [InlineData("min_rows: many", "min_rows", "whole number")]
    [InlineData("missing: impute", "missing", "skip-row or fail")]
    [InlineData("intercept: maybe", "intercept", "true or false")]
    [InlineData("features: temperature", "features", "must be a list")]
    [InlineData("features: [temperature, temperature]", "features[1]", "listed twice")]
    [InlineData("features: [temperature, loaves]", "features[1]", "is the outcome")]
    [InlineData("features: []", "features", "at least one feature")]
    [InlineData("label_delay: soon", "label_delay", "duration")]
    [InlineData("parallel_reads: 40", "parallel_reads", "between 1 and 16")]
    [InlineData("notify: [ops team]", "notify[0]", "notification target")]
    [InlineData("checks: [drift]", "checks", "mapping")]
    [InlineData("checks: { drift: 3 }", "checks.drift", "mapping")]
    [InlineData("colour: blue", "colour", "unknown field")]
    [InlineData("query: SELECT * FROM sales WHERE sold_at < @window_end", "query", "@window_start")]
    [InlineData("query: SELECT 1 WHERE @window_start < @window_end; DROP TABLE sales", "query", "single SQL statement")]
    [InlineData("query: \"SELECT * FROM sales WHERE sold_at < @window_end -- AND sold_at >= @window_start\"", "query", "uses @window_start only inside a comment, a string or a quoted identifier, where it filters nothing")]
    [InlineData("query: \"SELECT * FROM sales WHERE note <> '@window_start' AND sold_at < @window_end\"", "query", "uses @window_start only inside a comment")]
    [InlineData("query: \"SELECT * FROM sales /* sold_at >= @window_start */ WHERE sold_at < @window_end\"", "query", "uses @window_start only inside a comment")]
    [InlineData("prediction_column: loaves", "prediction_column", "already the outcome")]
    [InlineData("outcome: { column: loaves, unit: '' }", "outcome.unit", "1 to 32 printable characters")]
    [InlineData("outcome: { column: loaves, units: each }", "outcome.units", "an outcome mapping has column and unit")]
    [InlineData("outcome: { unit: loaves }", "outcome", "is required: a column name")]
    [InlineData("source: 'shop floor'", "source", "data source")]
    public void Each_invalid_field_is_reported_with_its_path(string replacement, string path, string message)
    {
        string field = replacement[..replacement.IndexOf(':', StringComparison.Ordinal)];
        string yaml = Replace(Full, field, replacement);
        var problems = new List<SpecProblem>();

        ModelSpec? spec = ModelSpecValidator.FromYaml("models/bakery.yaml", yaml, problems);

        Assert.Null(spec);
        SpecProblem problem = Assert.Single(problems);
        Assert.Equal("models/bakery.yaml", problem.File);
        Assert.Equal(path, problem.FieldPath);
        Assert.Contains(message, problem.Message, StringComparison.Ordinal);
        Assert.StartsWith($"models/bakery.yaml: {path}: ", problem.ToString(), StringComparison.Ordinal);
    }

    [Fact]
    public void Every_problem_is_listed_not_just_the_first()
    {
        var problems = new List<SpecProblem>();

        ModelSpec? spec = ModelSpecValidator.FromYaml("x.yaml", "key: X\nwindow: soon\nschedule: never\nmissing: maybe\n", problems);

        Assert.Null(spec);
        Assert.Equal(
            ["key", "query", "time_column", "outcome", "features", "schedule", "window", "missing"],
            problems.Select(p => p.FieldPath));
    }

    [Theory]
    [InlineData("key: [unclosed", "not valid YAML")]
    [InlineData("- a\n- b", "top level is a mapping")]
    public void Broken_yaml_is_reported_with_the_file(string yaml, string message)
    {
        var problems = new List<SpecProblem>();

        Assert.Null(ModelSpecValidator.FromYaml("bad.yaml", yaml, problems));

        Assert.Contains(message, Assert.Single(problems).ToString(), StringComparison.Ordinal);
    }

    [Theory]
    [InlineData("90s", 90)]
    [InlineData("90000s", 90_000)]
    [InlineData("15m", 900)]
    [InlineData("36h", 129_600)]
    [InlineData("7d", 604_800)]
    [InlineData("2w", 1_209_600)]
    public void Durations_are_an_integer_and_a_unit(string text, long seconds)
    {
        Assert.True(Duration.TryParse(text, out Duration duration, out _));
        Assert.Equal(TimeSpan.FromSeconds(seconds), duration.Length);
        Assert.Equal(text, duration.ToString());
    }

    [Theory]
    [InlineData("999999999w")]
    [InlineData("1.5h")]
    [InlineData("h")]
    [InlineData("10 m")]
    [InlineData("10M")]
    public void Malformed_or_huge_durations_are_refused(string text)
    {
        Assert.False(Duration.TryParse(text, out _, out string error));
        Assert.Contains(text, error, StringComparison.Ordinal);
    }

    [Fact]
    public void Interval_slots_are_anchored_at_the_unix_epoch()
    {
        Assert.True(Schedule.TryParse("15m", out Schedule? schedule, out _));
        var at = new DateTimeOffset(2026, 3, 1, 10, 7, 30, TimeSpan.Zero);

        Assert.Equal(new DateTimeOffset(2026, 3, 1, 10, 0, 0, TimeSpan.Zero), schedule!.SlotAtOrBefore(at));
        Assert.Equal(new DateTimeOffset(2026, 3, 1, 10, 15, 0, TimeSpan.Zero), schedule.NextSlotAfter(at));
    }

    [Fact]
    public void Cron_slots_are_read_in_utc()
    {
        Assert.True(Schedule.TryParse("30 6 * * 1-5", out Schedule? schedule, out _));
        var saturday = new DateTimeOffset(2026, 3, 7, 12, 0, 0, TimeSpan.Zero);

        Assert.Equal(new DateTimeOffset(2026, 3, 6, 6, 30, 0, TimeSpan.Zero), schedule!.SlotAtOrBefore(saturday));
        Assert.Equal(new DateTimeOffset(2026, 3, 9, 6, 30, 0, TimeSpan.Zero), schedule.NextSlotAfter(saturday));
    }

    private static string Replace(string yaml, string field, string replacement)
    {
        var lines = yaml.Split('\n').ToList();
        int at = lines.FindIndex(l => l.StartsWith(field + ":", StringComparison.Ordinal));
        if (at < 0)
        {
            lines.Add(replacement);
            return string.Join('\n', lines);
        }

        int end = at + 1;
        while (end < lines.Count && lines[end].StartsWith(' '))
        {
            end++;
        }

        lines.RemoveRange(at, end - at);
        lines.Insert(at, replacement);
        return string.Join('\n', lines);
    }
}
