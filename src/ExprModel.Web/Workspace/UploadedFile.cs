namespace ExprModel.Web.Workspace;

/// <summary>One uploaded file as received: its name (as the user sent it) and its bytes.</summary>
public sealed record UploadedFile(string Name, byte[] Bytes);
