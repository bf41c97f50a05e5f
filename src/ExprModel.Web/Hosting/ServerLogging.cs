namespace ExprModel.Web.Hosting;

/// <summary>
/// Logging: quiet by default outside Development (Warning and above, not one line per request), unless the standard
/// Logging:LogLevel settings say otherwise; one JSON object per entry on the console with <see cref="WebOptions.LogFormat"/>
/// = json, for log collectors.
/// </summary>
public static class ServerLogging
{
    public static void Configure(WebApplicationBuilder builder, WebOptions options)
    {
        bool levelConfigured = builder.Configuration.GetSection("Logging:LogLevel").GetChildren().Any();
        if (!builder.Environment.IsDevelopment() && !levelConfigured) builder.Logging.SetMinimumLevel(LogLevel.Warning);
        if (options.LogFormat == "json")
        {
            builder.Logging.ClearProviders();
            builder.Logging.AddJsonConsole(o =>
            {
                o.UseUtcTimestamp = true;
                o.TimestampFormat = "yyyy-MM-ddTHH:mm:ss.fffZ";
            });
        }
    }
}
