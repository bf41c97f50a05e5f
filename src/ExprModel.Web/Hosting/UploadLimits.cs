using ExprModel.Core.Expression;

namespace ExprModel.Web.Hosting;

/// <summary>What an uploaded table may inflate to and how many lines it may have (<see cref="WebOptions"/>).</summary>
public sealed record UploadLimits(long MaxDecompressedBytes, long MaxLines)
{
    /// <summary>No limits beyond the library's own (tests and tools).</summary>
    public static UploadLimits None { get; } = new(ExpressionReadOptions.Default.MaxDecompressedBytes, long.MaxValue);

    /// <summary>The library's message for a passed limit, with the settings that hold the limits.</summary>
    public string Explain(ExpressionLimitException e) =>
        $"{e.Message} This server reads tables of at most {MaxLines:N0} lines ({WebOptions.Section}:MaxTableLines) inflating to at most "
            + $"{MaxDecompressedBytes / (1024.0 * 1024.0):0.##} MB ({WebOptions.Section}:MaxDecompressedMegabytes).";
}
