using ModelWatch.Checks.Summaries;
using ModelWatch.Store.Configuration;
using ModelWatch.Store.Models;
using ModelWatch.Store.Specs;
using ModelWatch.Store.Windows;

namespace ModelWatch.Store.Baselines;

/// <summary>
/// <c>baseline fit</c> and <c>baseline import</c>: read the reference window (if any) from the model's data source
/// into a <see cref="BaselineBuilder"/>, complete the reference statistics and store them as a new version, which becomes
/// the active one. Everything is read and computed before the single insert, so a failure stores nothing. The
/// <c>Prepare…</c> methods stop before storing, for callers that store in a transaction of their own.
/// </summary>
public sealed class BaselineService
{
    private readonly StoreDataSources _databases;
    private readonly ModelRepository _models;
    private readonly BaselineRepository _baselines;
    private readonly WindowReader _reader;
    private readonly BaselineBuilderOptions _builderOptions;

    /// <summary>Creates the service.</summary>
    public BaselineService(StoreDataSources databases, TimeProvider time, TimeSpan commandTimeout, WindowReadOptions? readOptions = null, BaselineBuilderOptions? builderOptions = null)
    {
        ArgumentNullException.ThrowIfNull(databases);
        _databases = databases;
        _models = new ModelRepository(databases.State, time, commandTimeout);
        _baselines = new BaselineRepository(databases.State, time, commandTimeout);
        _reader = new WindowReader(readOptions ?? databases.ReadOptions());
        _builderOptions = builderOptions ?? new BaselineBuilderOptions();
    }

    /// <summary>Fits a baseline on <c>[from, to)</c>, stores it as the active version and returns it.</summary>
    public async Task<StoredBaseline> FitAsync(string modelKey, DateTimeOffset from, DateTimeOffset to, string createdBy, CancellationToken cancellationToken) =>
        await StoreAsync(await PrepareFitAsync(modelKey, from, to, cancellationToken), createdBy, cancellationToken);

    /// <summary>
    /// Imports coefficients from <paramref name="json"/> (read from <paramref name="file"/>), stores them as the active
    /// version and returns it; when a reference window is given, its rows complete the reference statistics (bins,
    /// residual sample, leverage, factor).
    /// </summary>
    public async Task<StoredBaseline> ImportAsync(string modelKey, string file, string json, (DateTimeOffset From, DateTimeOffset To)? window, string createdBy, CancellationToken cancellationToken) =>
        await StoreAsync(await PrepareImportAsync(modelKey, file, json, window, cancellationToken), createdBy, cancellationToken);

    /// <summary>Reads <c>[from, to)</c> and fits a baseline on it without storing anything.</summary>
    public async Task<PreparedBaseline> PrepareFitAsync(string modelKey, DateTimeOffset from, DateTimeOffset to, CancellationToken cancellationToken)
    {
        ModelSpec spec = await SpecAsync(modelKey, cancellationToken);
        BaselineSink sink = await ReadAsync(spec, from, to, cancellationToken);
        BaselineReference reference;
        try
        {
            reference = sink.Builder.Build(BaselineOrigin.Fitted);
        }
        catch (Exception ex) when (ex is InvalidOperationException or ArgumentException)
        {
            throw new BaselineException($"model {modelKey}: cannot fit a baseline on [{from:yyyy-MM-ddTHH:mm:ssZ}, {to:yyyy-MM-ddTHH:mm:ssZ}): {ex.Message}", ex);
        }

        return new PreparedBaseline(spec, reference, (from, to));
    }

    /// <summary>Parses an import file and completes its statistics from the reference window (if any) without storing anything.</summary>
    public async Task<PreparedBaseline> PrepareImportAsync(string modelKey, string file, string json, (DateTimeOffset From, DateTimeOffset To)? window, CancellationToken cancellationToken)
    {
        ModelSpec spec = await SpecAsync(modelKey, cancellationToken);
        ImportedCoefficients imported = BaselineImportFile.Parse(file, json, spec.Layout);
        BaselineBuilder builder = window is { } w
            ? (await ReadAsync(spec, w.From, w.To, cancellationToken)).Builder
            : new BaselineBuilder(spec.Layout, _builderOptions);
        BaselineReference reference;
        try
        {
            reference = builder.Build(BaselineOrigin.Imported, imported);
        }
        catch (Exception ex) when (ex is InvalidOperationException or ArgumentException)
        {
            throw new BaselineException($"model {modelKey}: cannot import {file}: {ex.Message}", ex);
        }

        return new PreparedBaseline(spec, reference, window is { } r ? (r.From, r.To) : null);
    }

    private async Task<ModelSpec> SpecAsync(string modelKey, CancellationToken cancellationToken) =>
        (await _models.GetAsync(modelKey, cancellationToken))?.Spec
        ?? throw new BaselineException($"model {modelKey}: no such model; apply its spec first ('modelwatch model apply')");

    private async Task<BaselineSink> ReadAsync(ModelSpec spec, DateTimeOffset from, DateTimeOffset to, CancellationToken cancellationToken)
    {
        if (to <= from)
        {
            throw new BaselineException($"model {spec.Key}: the reference window end {to:O} is not after its start {from:O}");
        }

        // The baseline builder keeps one reservoir over the whole window, so the reference window is one sequential read.
        var result = await _reader.ReadAsync(_databases.Source(spec.Source), spec, from, to, () => new BaselineSink(spec.Layout, _builderOptions), null, cancellationToken);
        WindowReader.EnsureMinimumRows(spec, result);
        return result.Sink;
    }

    private async Task<StoredBaseline> StoreAsync(PreparedBaseline prepared, string createdBy, CancellationToken cancellationToken)
    {
        string key = prepared.Spec.Key;
        int version = await _baselines.AddAsync(key, prepared.Reference, prepared.ReferenceWindow, createdBy, cancellationToken);
        return await _baselines.GetAsync(key, version, cancellationToken)
            ?? throw new BaselineException($"model {key}: baseline version {version} was stored but cannot be read back");
    }
}
