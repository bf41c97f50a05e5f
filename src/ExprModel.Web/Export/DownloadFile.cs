namespace ExprModel.Web.Export;

/// <summary>A file the browser downloads.</summary>
public sealed record DownloadFile(string Name, string Mime, string Text);
