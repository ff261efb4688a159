using System.CommandLine;
using System.Globalization;
using ModelWatch.Daemon.Alerts;
using ModelWatch.Store.Baselines;

namespace ModelWatch.Cli.Commands;

/// <summary><c>modelwatch baseline activate KEY N [--keep-alerts]</c>: choose the version the model is watched against.</summary>
internal static class BaselineActivateCommand
{
    public static Command Create()
    {
        var key = new Argument<string>("key") { Description = "The model's key" };
        var version = new Argument<int>("version") { Description = "The stored version every check will compare with" };
        var keepAlerts = BaselineOutput.KeepAlertsOption();
        var database = StoreCommandRunner.DatabaseOption();
        var command = new Command("activate", "Make a stored baseline version the one the model is watched against") { key, version, keepAlerts, database };
        command.SetAction((parse, cancellationToken) => StoreCommandRunner.RunAsync(parse, "baseline activate", database, async (databases, output, ct) =>
        {
            await ModelKeys.RequireAsync(databases, parse.GetRequiredValue(key), ct);
            string model = parse.GetRequiredValue(key);
            var activation = new BaselineActivation(databases.State, TimeProvider.System, StoreCommandRunner.CommandTimeout);
            ActivationOutcome outcome = await activation.ActivateAsync(model, parse.GetValue(version), StoreCommandRunner.Actor, parse.GetValue(keepAlerts), ct);
            BaselineVersions versions = await new BaselineRepository(databases.State, TimeProvider.System, StoreCommandRunner.CommandTimeout).VersionsAsync(model, ct)
                ?? throw new BaselineException($"no model '{model}'");
            string was = outcome.PreviousVersion is { } previous ? previous.ToString(CultureInfo.InvariantCulture) : "none";
            output.WriteLine(string.Create(CultureInfo.InvariantCulture, $"{model}: now watched against baseline {outcome.Version} (was {was})"));
            if (versions.Versions.Count > 0 && outcome.Version != versions.Versions[^1])
            {
                // Said plainly because it is easy to miss: an older baseline redefines "normal" for every check.
                output.WriteLine(string.Create(CultureInfo.InvariantCulture,
                    $"note: version {outcome.Version} is older than the newest ({versions.Versions[^1]}); every check now compares the data with version {outcome.Version}'s coefficients and reference statistics, and sequential statistics restart"));
            }

            BaselineOutput.WriteAlerts(output, outcome);
            return ExitCodes.Ok;
        }, cancellationToken));
        return command;
    }
}
