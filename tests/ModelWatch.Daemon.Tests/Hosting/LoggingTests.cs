using Microsoft.Extensions.Configuration;
using ModelWatch.Daemon.Hosting;
using Serilog;
using Serilog.Core;
using Serilog.Events;
using Serilog.Parsing;

namespace ModelWatch.Daemon.Tests.Hosting;

public sealed class LoggingTests
{
    [Fact]
    public void Console_times_are_utc_with_a_z_whatever_the_events_offset()
    {
        var at = new DateTimeOffset(2026, 12, 2, 9, 30, 15, 250, TimeSpan.FromHours(5));
        var logEvent = new LogEvent(at, LogEventLevel.Information, null, new MessageTemplateParser().Parse("x"), []);

        new UtcTimestampEnricher().Enrich(logEvent, new PropertyFactory());

        Assert.Equal("\"2026-12-02T04:30:15.250Z\"", logEvent.Properties[UtcTimestampEnricher.Property].ToString());
    }

    [Fact]
    public void Levels_come_from_the_standard_logging_section()
    {
        IConfiguration configuration = new ConfigurationBuilder().AddInMemoryCollection(new Dictionary<string, string?>
        {
            ["Logging:LogLevel:Default"] = "Warning",
            ["Logging:LogLevel:ModelWatch.Daemon.Scheduling"] = "Debug",
        }).Build();
        var configured = new LoggerConfiguration();
        LogLevels.Apply(configured, configuration);
        using Logger logger = configured.CreateLogger();

        Assert.False(logger.IsEnabled(LogEventLevel.Information));
        Assert.True(logger.IsEnabled(LogEventLevel.Warning));
        Assert.True(logger.ForContext(Constants.SourceContextPropertyName, "ModelWatch.Daemon.Scheduling.SchedulerService").IsEnabled(LogEventLevel.Debug));
        Assert.False(logger.ForContext(Constants.SourceContextPropertyName, "Npgsql.Connection").IsEnabled(LogEventLevel.Information));
    }

    private sealed class PropertyFactory : ILogEventPropertyFactory
    {
        public LogEventProperty CreateProperty(string name, object? value, bool destructureObjects = false) => new(name, new ScalarValue(value));
    }
}
