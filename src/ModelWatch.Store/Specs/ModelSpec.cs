using System.Security.Cryptography;
using System.Text;
using System.Text.Json;
using ModelWatch.Numerics.Regression;

namespace ModelWatch.Store.Specs;

/// <summary>
/// A validated model spec: what to read, how to fit it and when. Built only by <see cref="ModelSpecValidator"/>,
/// so every instance satisfies the documented schema (docs/model-spec.md). Immutable.
/// </summary>
public sealed class ModelSpec
{
    internal ModelSpec(ModelSpecDocument normalised, Schedule schedule, Duration window, Duration labelDelay, MissingValuePolicy missing)
    {
        Document = normalised;
        Key = normalised.Key!;
        Description = normalised.Description;
        Source = normalised.Source;
        Query = normalised.Query!;
        TimeColumn = normalised.TimeColumn!;
        Layout = new DesignLayout(normalised.Features!, normalised.Outcome!, normalised.Intercept!.Value);
        Schedule = schedule;
        Window = window;
        MinRows = normalised.MinRows!.Value;
        Missing = missing;
        Checks = normalised.Checks!.ToDictionary(c => c.Key, c => (IReadOnlyDictionary<string, string>)c.Value, StringComparer.Ordinal);
        Notify = [.. normalised.Notify!];
        LabelDelay = labelDelay;
        PredictionColumn = normalised.PredictionColumn;
        OutcomeUnit = normalised.OutcomeUnit;
        Enabled = normalised.Enabled!.Value;
        ParallelReads = normalised.ParallelReads!.Value;
        DesignSignature = SignatureOf(Layout);
    }

    /// <summary>Lowercase letters, digits and '-': the model's name everywhere.</summary>
    public string Key { get; }

    /// <summary>Free text for people.</summary>
    public string? Description { get; }

    /// <summary>Name of the data source (<c>Sources:&lt;name&gt;</c>), or null for the state database.</summary>
    public string? Source { get; }

    /// <summary>SQL returning the window's rows; uses <c>@window_start</c> and <c>@window_end</c> (timestamptz, half-open).</summary>
    public string Query { get; }

    /// <summary>Column the rows are ordered by.</summary>
    public string TimeColumn { get; }

    /// <summary>Outcome, features and intercept.</summary>
    public DesignLayout Layout { get; }

    /// <summary>Outcome column.</summary>
    public string Outcome => Layout.Outcome;

    /// <summary>The outcome's unit as people read it (axis titles), or null when the spec names none.</summary>
    public string? OutcomeUnit { get; }

    /// <summary>Feature columns, in design order.</summary>
    public IReadOnlyList<string> Features => Layout.Features;

    /// <summary>Whether the design has an intercept.</summary>
    public bool Intercept => Layout.Intercept;

    /// <summary>When runs are due.</summary>
    public Schedule Schedule { get; }

    /// <summary>Length of the window a run reads.</summary>
    public Duration Window { get; }

    /// <summary>Fewest usable rows for a run to go ahead.</summary>
    public int MinRows { get; }

    /// <summary>What to do with NULL or non-finite values.</summary>
    public MissingValuePolicy Missing { get; }

    /// <summary>Per-check setting overrides, as written (each check parses its own settings).</summary>
    public IReadOnlyDictionary<string, IReadOnlyDictionary<string, string>> Checks { get; }

    /// <summary>Notification target names.</summary>
    public IReadOnlyList<string> Notify { get; }

    /// <summary>How late outcomes arrive: a run at slot t reads the window ending at t − label_delay.</summary>
    public Duration LabelDelay { get; }

    /// <summary>Optional column with the prediction production served.</summary>
    public string? PredictionColumn { get; }

    /// <summary>Whether the daemon runs this model.</summary>
    public bool Enabled { get; }

    /// <summary>Number of time sub-ranges read at once on separate connections (1 = one read).</summary>
    public int ParallelReads { get; }

    /// <summary>Identifies the design (outcome, features in order, intercept); a baseline fits the spec only when they match.</summary>
    public string DesignSignature { get; }

    internal ModelSpecDocument Document { get; }

    /// <summary>The window a run at <paramref name="slot"/> reads: <c>[slot − label_delay − window, slot − label_delay)</c>.</summary>
    public (DateTimeOffset Start, DateTimeOffset End) WindowForSlot(DateTimeOffset slot)
    {
        DateTimeOffset end = slot.ToUniversalTime() - LabelDelay.Length;
        return (end - Window.Length, end);
    }

    /// <summary>The normalised spec as JSON (defaults filled in), as stored in the state database.</summary>
    public string ToJson() => JsonSerializer.Serialize(Document, SpecJson.Options);

    /// <summary>SHA-256 of <see cref="ToJson"/>, hex.</summary>
    public string Sha256() => Convert.ToHexStringLower(SHA256.HashData(Encoding.UTF8.GetBytes(ToJson())));

    /// <summary>The design signature of a layout: <c>outcome ~ [1 +] f1 + f2 ...</c>.</summary>
    public static string SignatureOf(DesignLayout layout)
    {
        ArgumentNullException.ThrowIfNull(layout);
        return $"{layout.Outcome} ~ {string.Join(" + ", layout.Intercept ? ["1", .. layout.Features] : layout.Features)}";
    }
}
