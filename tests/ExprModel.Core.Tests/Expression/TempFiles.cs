using System.IO.Compression;
using System.Text;

namespace ExprModel.Core.Tests.Expression;

/// <summary>A scratch directory for files a test writes, removed afterwards.</summary>
public sealed class TempFiles : IDisposable
{
    public string Dir { get; } = Directory.CreateTempSubdirectory("exprmodel-expr-").FullName;

    public string Text(string name, string content, bool bom = false, bool gzip = false)
    {
        var bytes = new UTF8Encoding(bom).GetPreamble().Concat(Encoding.UTF8.GetBytes(content)).ToArray();
        return Bytes(name, gzip ? Gzip(bytes) : bytes);
    }

    public string Bytes(string name, byte[] content)
    {
        var path = Path.Combine(Dir, name);
        Directory.CreateDirectory(Path.GetDirectoryName(path)!);
        File.WriteAllBytes(path, content);
        return path;
    }

    public static byte[] Gzip(byte[] data)
    {
        using var ms = new MemoryStream();
        using (var gz = new GZipStream(ms, CompressionLevel.Fastest)) gz.Write(data);
        return ms.ToArray();
    }

    public void Dispose()
    {
        try { Directory.Delete(Dir, recursive: true); } catch (IOException) { }
    }
}
