namespace ExprModel.Web.Hosting;

/// <summary>Reads an upload into memory, stopping with a clear message as soon as it passes the configured limit.</summary>
public static class BoundedUpload
{
    public static string LimitMessage(long limitBytes, string what) =>
        $"{what} is larger than this server's upload limit of {limitBytes / (1024.0 * 1024.0):0.##} MB. Split the table, keep only the needed genes, " +
            "or raise ExprModel:MaxUploadMegabytes.";

    public static async Task<byte[]> ReadAsync(Stream body, long? declaredLength, long limitBytes, string what, CancellationToken cancel)
    {
        if (declaredLength > limitBytes) throw new UploadTooLargeException(LimitMessage(limitBytes, what));
        using var buffer = new MemoryStream();
        var chunk = new byte[81920];
        int n;
        while ((n = await body.ReadAsync(chunk, cancel)) > 0)
        {
            if (buffer.Length + n > limitBytes) throw new UploadTooLargeException(LimitMessage(limitBytes, what));
            buffer.Write(chunk, 0, n);
        }
        return buffer.ToArray();
    }
}
