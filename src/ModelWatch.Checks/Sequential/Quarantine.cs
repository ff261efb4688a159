namespace ModelWatch.Checks.Sequential;

/// <summary>
/// When new rows may join a CUSUM's running fit (or running means and counts): not from the CUSUM's alarm until its
/// sums are back at zero. Rows of a shift would pull the running fit towards it, and the shift's end would then look
/// like a new shift the other way; kept out, the sums keep signalling while the shift lasts and fall back after it.
/// Under no change alarms are rare, so the CUSUM's inputs stay independent nearly always.
/// </summary>
internal static class Quarantine
{
    /// <summary>Whether any sum alarmed in this step (its alarm count rose).</summary>
    public static bool Alarmed(IReadOnlyDictionary<string, CusumSums> before, IReadOnlyDictionary<string, CusumSums> after) =>
        after.Any(kv => kv.Value.Alarms > before.GetValueOrDefault(kv.Key, new CusumSums()).Alarms);

    /// <summary>Whether rows stay out after this step: an alarm now, or a quarantine whose sums are not yet all back at zero.</summary>
    public static bool After(bool quarantined, bool alarmed, IEnumerable<CusumSums> sums) =>
        alarmed || (quarantined && sums.Any(s => s.Peak > 0.0));
}
