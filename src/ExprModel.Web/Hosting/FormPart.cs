namespace ExprModel.Web.Hosting;

/// <summary>A part of a multipart/form-data body: its bytes and the file name the client sent (null for a plain field).</summary>
public sealed record FormPart(string Name, string? FileName, byte[] Bytes)
{
    public string Text => System.Text.Encoding.UTF8.GetString(Bytes);
}
