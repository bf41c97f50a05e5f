using Microsoft.Extensions.DependencyInjection;
using Microsoft.Extensions.Logging;
using Microsoft.Extensions.Logging.Console;
using Microsoft.Extensions.Options;

namespace ExprModel.Web.Tests.Hosting;

public sealed class ServerLoggingTests
{
    /// <summary>The category of the framework's one-line-per-request log.</summary>
    private const string RequestLog = "Microsoft.AspNetCore.Hosting.Diagnostics";

    [Fact]
    public void Production_logs_warnings_only_by_default_and_json_when_asked()
    {
        using var quiet = new ConfiguredAppFactory(new Dictionary<string, string>(), environment: "Production");
        Assert.Equal(LogLevel.Warning, quiet.Services.GetRequiredService<IOptions<LoggerFilterOptions>>().Value.MinLevel);
        Assert.False(quiet.Services.GetRequiredService<ILoggerFactory>().CreateLogger(RequestLog).IsEnabled(LogLevel.Information));

        using var json = new ConfiguredAppFactory(new Dictionary<string, string> { ["LogFormat"] = "json" }, environment: "Production");
        Assert.Equal(ConsoleFormatterNames.Json, json.Services.GetRequiredService<IOptionsMonitor<ConsoleLoggerOptions>>().CurrentValue.FormatterName);

        // The standard setting still wins when given.
        using var chatty = new ConfiguredAppFactory(new Dictionary<string, string> { ["Logging:LogLevel:Default"] = "Information" }, environment: "Production");
        Assert.True(chatty.Services.GetRequiredService<ILoggerFactory>().CreateLogger(RequestLog).IsEnabled(LogLevel.Information));
    }

    [Fact]
    public void A_bad_public_address_or_log_format_stops_start_up_naming_the_setting()
    {
        using var badUrl = new ConfiguredAppFactory(new Dictionary<string, string> { ["PublicBaseUrl"] = "models.example.org" });
        var e = Assert.ThrowsAny<Exception>(() => badUrl.Services);
        Assert.Contains("ExprModel:PublicBaseUrl: 'models.example.org'", e.ToString());
        using var badFormat = new ConfiguredAppFactory(new Dictionary<string, string> { ["LogFormat"] = "xml" });
        Assert.Contains("ExprModel:LogFormat: 'xml'", Assert.ThrowsAny<Exception>(() => badFormat.Services).ToString());
    }
}
