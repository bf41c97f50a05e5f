namespace ExprModel.Web.Hosting;

/// <summary>
/// Endpoint metadata: the largest request body a route takes, read from <see cref="WebOptions"/> and named by its setting in
/// the 413 answer (<see cref="RequestBodyLimits"/>).
/// </summary>
public sealed record BodyLimit(Func<WebOptions, long> Bytes, string Setting, string What)
{
    /// <summary>A JSON body carrying a model (a model file is a few kilobytes).</summary>
    public static BodyLimit ModelRequest { get; } = new(o => o.MaxModelRequestBytes, "MaxModelRequestKilobytes", "A model request");

    /// <summary>A model to share, with its optional expression table.</summary>
    public static BodyLimit Snapshot { get; } = new(o => o.MaxSnapshotBytes, "MaxSnapshotMegabytes", "A shared model");

    /// <summary>A request carrying uploaded tables or recordings.</summary>
    public static BodyLimit Upload { get; } = new(o => o.MaxUploadBytes, "MaxUploadMegabytes", "The upload");

    public string Message(long limitBytes) =>
        $"{What} is larger than this server's limit of {Size(limitBytes)} for this route ({WebOptions.Section}:{Setting}).";

    private static string Size(long bytes) => bytes >= 1024 * 1024 ? $"{bytes / (1024.0 * 1024.0):0.##} MB" : $"{bytes / 1024.0:0.##} KB";
}
