using System.CommandLine;
using System.Text.Json;
using ModelWatch.Cli.Output;
using ModelWatch.Daemon.Alerts;
using ModelWatch.Store.Models;

namespace ModelWatch.Cli.Commands;

/// <summary><c>modelwatch model list</c> and <c>modelwatch model show KEY</c>, as aligned text or JSON.</summary>
internal static class ModelListCommand
{
    public static Command CreateList()
    {
        var format = new Option<OutputFormat>("--format") { Description = "table or json", DefaultValueFactory = _ => OutputFormat.Table };
        var database = StoreCommandRunner.DatabaseOption();
        var command = new Command("list", "List registered models") { format, database };
        command.SetAction((parse, cancellationToken) => StoreCommandRunner.RunAsync(parse, "model list", database, async (databases, output, ct) =>
        {
            IReadOnlyList<ModelRecord> models = await new ModelRepository(databases.State, TimeProvider.System, StoreCommandRunner.CommandTimeout).ListAsync(ct);
            if (parse.GetValue(format) == OutputFormat.Json)
            {
                CliJson.Write(output, writer =>
                {
                    writer.WriteStartArray();
                    foreach (ModelRecord model in models)
                    {
                        WriteModel(writer, model, withSpec: false);
                    }

                    writer.WriteEndArray();
                });
                return ExitCodes.Ok;
            }

            string[] header = ["KEY", "ENABLED", "SCHEDULE", "WINDOW", "SOURCE", "BASELINE", "NEXT DUE"];
            List<string[]> rows = [header, .. models.Select(m => new[]
            {
                m.Key, m.Enabled ? "yes" : "no", m.Spec.Schedule.Text, m.Spec.Window.ToString(), m.Spec.Source ?? "(state)",
                m.BaselineVersion is null ? "none" : m.HasCompatibleBaseline ? $"v{m.BaselineVersion}" : $"v{m.BaselineVersion} (incompatible)",
                CliJson.Time(m.NextDueSlot) ?? "-",
            })];
            CliJson.WriteTable(output, rows);

            return ExitCodes.Ok;
        }, cancellationToken));
        return command;
    }

    public static Command CreateShow()
    {
        var key = new Argument<string>("key") { Description = "The model's key" };
        var format = new Option<OutputFormat>("--format") { Description = "table or json", DefaultValueFactory = _ => OutputFormat.Table };
        var database = StoreCommandRunner.DatabaseOption();
        var command = new Command("show", "Show one model: its stored spec, state and baseline") { key, format, database };
        command.SetAction((parse, cancellationToken) => StoreCommandRunner.RunAsync(parse, "model show", database, async (databases, output, ct) =>
        {
            ModelRecord model = await ModelKeys.RequireAsync(databases, parse.GetRequiredValue(key), ct);

            IReadOnlyList<QuietPeriod> quiet = await new QuietPeriodRepository(databases.State, StoreCommandRunner.CommandTimeout).ListAsync(false, model.Key, TimeProvider.System.GetUtcNow(), ct);
            if (parse.GetValue(format) == OutputFormat.Json)
            {
                CliJson.Write(output, writer => WriteModel(writer, model, withSpec: true, quiet));
                return ExitCodes.Ok;
            }

            output.WriteLine($"model:     {model.Key}{(model.Enabled ? string.Empty : " (disabled)")}");
            output.WriteLine($"design:    {model.Spec.DesignSignature}");
            output.WriteLine($"source:    {model.Spec.Source ?? "(state database)"}");
            output.WriteLine($"schedule:  {model.Spec.Schedule.Text}, window {model.Spec.Window}, label delay {model.Spec.LabelDelay}, next due {CliJson.Time(model.NextDueSlot) ?? "-"}");
            output.WriteLine($"baseline:  {(model.BaselineProblem is { } problem ? problem : $"version {model.BaselineVersion}")}");
            output.WriteLine($"lease:     {(model.LeaseOwner is null ? "-" : $"{model.LeaseOwner} until {CliJson.Time(model.LeaseExpiresAt)}")}");
            output.WriteLine(quiet.Count == 0 ? "quiet:     -" : TerminalText.Clean("quiet:     " + string.Join("; ", quiet.Select(q =>
                $"{(q.Check ?? "all checks")} until {CliJson.Time(q.Until)} (quiet period {q.Id}, {q.CreatedBy}: {q.Reason})"))));
            output.WriteLine($"spec file: {model.SourceFile ?? "-"}");
            output.WriteLine($"query:     {model.Spec.Query.ReplaceLineEndings(Environment.NewLine + "           ")}");
            return ExitCodes.Ok;
        }, cancellationToken));
        return command;
    }

    private static void WriteModel(Utf8JsonWriter writer, ModelRecord model, bool withSpec, IReadOnlyList<QuietPeriod>? quiet = null)
    {
        writer.WriteStartObject();
        writer.WriteString("key", model.Key);
        writer.WriteBoolean("enabled", model.Enabled);
        writer.WriteString("schedule", model.Spec.Schedule.Text);
        writer.WriteString("window", model.Spec.Window.ToString());
        writer.WriteString("source", model.Spec.Source);
        writer.WriteString("design", model.Spec.DesignSignature);
        if (model.BaselineVersion is { } version)
        {
            writer.WriteNumber("baseline_version", version);
        }
        else
        {
            writer.WriteNull("baseline_version");
        }

        writer.WriteBoolean("baseline_compatible", model.HasCompatibleBaseline);
        writer.WriteString("next_due_slot", CliJson.Time(model.NextDueSlot));
        writer.WriteString("lease_owner", model.LeaseOwner);
        writer.WriteString("lease_expires_at", CliJson.Time(model.LeaseExpiresAt));
        writer.WriteString("updated_at", CliJson.Time(model.UpdatedAt));
        if (quiet is not null)
        {
            writer.WriteStartArray("quiet_periods");
            foreach (QuietPeriod period in quiet)
            {
                writer.WriteStartObject();
                writer.WriteNumber("id", period.Id);
                writer.WriteString("check", period.Check);
                writer.WriteString("until", CliJson.Time(period.Until));
                writer.WriteString("reason", period.Reason);
                writer.WriteString("created_by", period.CreatedBy);
                writer.WriteEndObject();
            }

            writer.WriteEndArray();
        }

        if (withSpec)
        {
            writer.WritePropertyName("spec");
            using JsonDocument spec = JsonDocument.Parse(model.Spec.ToJson());
            spec.RootElement.WriteTo(writer);
        }

        writer.WriteEndObject();
    }
}
