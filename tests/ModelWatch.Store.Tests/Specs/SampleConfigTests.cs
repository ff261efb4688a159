using ModelWatch.Store.Specs;

namespace ModelWatch.Store.Tests.Specs;

public sealed class SampleConfigTests
{
    [Fact]
    public void Every_sample_model_spec_is_valid()
    {
        string dir = AppContext.BaseDirectory;
        while (!File.Exists(Path.Combine(dir, "ModelWatch.sln")))
        {
            dir = Path.GetDirectoryName(dir) ?? throw new InvalidOperationException("The repository root (ModelWatch.sln) was not found above the test folder.");
        }

        IReadOnlyList<(ModelSpec Spec, string File)> specs = ModelSpecFiles.Load(Path.Combine(dir, "sample-config", "models"));

        Assert.Contains(specs, s => s.Spec.Key == "courier-delivery-minutes" && s.Spec.PredictionColumn == "predicted_minutes");
        Assert.Contains(specs, s => s.Spec.Key == "bakery-daily-demand" && s.Spec.Schedule.Interval is null);
    }
}
