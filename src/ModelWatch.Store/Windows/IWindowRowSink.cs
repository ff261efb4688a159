namespace ModelWatch.Store.Windows;

/// <summary>
/// Where a window read puts its rows, one at a time and in time order. Values are always finite: the reader
/// applies the spec's <c>missing</c> policy to NULL and non-finite values before a row gets here.
/// </summary>
public interface IWindowRowSink
{
    /// <summary>
    /// Takes one row; <paramref name="servedPrediction"/> is null when the spec has no prediction column or the value was NULL;
    /// <paramref name="isNew"/> is true when the row's time is at or after the read's <c>newRowsFrom</c> (rows the previous
    /// run did not see, which sequential statistics consume).
    /// </summary>
    void AddRow(ReadOnlySpan<double> features, double outcome, double? servedPrediction, bool isNew);
}
