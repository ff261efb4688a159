using System.Globalization;
using ModelWatch.Checks.Evaluation;
using ModelWatch.Checks.Findings;
using ModelWatch.Checks.Policy;

namespace ModelWatch.Checks.Tests.Evaluation;

/// <summary>The plug-in seam: what every registered check declares, and that the spec reader and the docs agree with it.</summary>
public sealed class CheckRegistryTests
{
    [Fact]
    public void Every_check_is_registered_once_in_run_order_with_its_runbook()
    {
        Assert.Equal(["source", "data", "serving", "coefficients", "collinearity", "residuals", "error", "features"], CheckRegistry.Names);
        Assert.Equal(CheckRegistry.Names, CheckNames.All);
        Assert.All(CheckRegistry.All, c => Assert.Equal(c.Name, c.Runbook.Check));
        Assert.Equal(CheckRegistry.Channels.Count, CheckRegistry.Channels.Select(c => c.Name).Distinct().Count());
    }

    [Fact]
    public void Every_setting_names_its_owner_and_its_default_reads_back_in_range()
    {
        foreach (IModelCheck check in CheckRegistry.All)
        {
            Assert.Equal(check.Settings.Count, check.Settings.Select(s => s.Name).Distinct().Count());
            Assert.All(check.Settings, s => Assert.Equal(check.Name, s.Check));
        }

        foreach (CheckSetting setting in CheckRegistry.All.SelectMany(c => c.Settings).Concat(PolicySettings.All.Where(s => s.Name is not ("alarm_channels" or "cusum_threshold"))))
        {
            string text = setting.Kind == SettingKind.Flag ? (setting.Default != 0).ToString() : setting.Default.ToString("R", CultureInfo.InvariantCulture);
            Assert.True(setting.TryParse(text, out double value, out string error), $"{setting.Key}: {error}");
            Assert.Equal(setting.Default, value);
        }

        // A model-wide setting must not share its name with a check's own, or a spec could not say which it meant.
        Assert.Empty(PolicySettings.All.Select(s => s.Name).Intersect(CheckRegistry.All.SelectMany(c => c.Settings).Select(s => s.Name)));
    }

    [Fact]
    public void Settings_are_read_under_their_owner_and_model_wide_ones_under_any_check()
    {
        var sections = new Dictionary<string, IReadOnlyDictionary<string, string>>
        {
            ["features"] = new Dictionary<string, string> { ["psi_warning"] = "0.15", ["ks_floor"] = "0.2" },
            ["residuals"] = new Dictionary<string, string> { ["ks_floor"] = "0.3", ["warning_alerts"] = "true" },
        };

        CheckThresholds t = CheckSettingsReader.Read(sections, TimeSpan.FromDays(1), TimeSpan.FromDays(7), 100, "m");

        Assert.Equal(0.15, t.Value(Features.FeaturesCheck.PsiWarning));
        Assert.Equal(0.2, t.Value(Features.FeaturesCheck.KsFloor));
        Assert.Equal(0.3, t.Value(Residuals.ResidualsCheck.KsFloor));
        Assert.True(t.WarningAlerts);
        Assert.Equal(TimeSpan.FromDays(1), t.Cadence);
        Assert.Equal(0.10, t.Value(Coefficients.CoefficientsCheck.DriftImpactFloor));
        ArgumentException wrong = Assert.Throws<ArgumentException>(() => CheckSettingsReader.Read(
            new Dictionary<string, IReadOnlyDictionary<string, string>> { ["coefficients"] = new Dictionary<string, string> { ["psi_warning"] = "0.15" } },
            TimeSpan.FromHours(1), TimeSpan.FromHours(1), null, "m"));
        Assert.Contains("model m: checks.coefficients: 'psi_warning' is a setting of the features check", wrong.Message, StringComparison.Ordinal);
    }

    [Fact]
    public void The_checks_documentation_lists_every_setting_and_channel_count()
    {
        string docs = File.ReadAllText(Path.Combine(RepositoryRoot(), "docs", "checks.md"));
        string table = docs[docs.IndexOf("## Settings", StringComparison.Ordinal)..docs.IndexOf("## Calibration", StringComparison.Ordinal)];
        foreach (CheckSetting setting in CheckRegistry.All.SelectMany(c => c.Settings).Concat(PolicySettings.All))
        {
            Assert.Contains($"`{setting.Name}`", table, StringComparison.Ordinal);
        }

        Assert.Contains($"K = {CheckRegistry.Channels.Count} registered channels", docs, StringComparison.Ordinal);
    }

    private static string RepositoryRoot()
    {
        for (DirectoryInfo? dir = new(AppContext.BaseDirectory); dir is not null; dir = dir.Parent)
        {
            if (File.Exists(Path.Combine(dir.FullName, "ModelWatch.sln")))
            {
                return dir.FullName;
            }
        }

        throw new DirectoryNotFoundException("ModelWatch.sln not found above " + AppContext.BaseDirectory);
    }
}
