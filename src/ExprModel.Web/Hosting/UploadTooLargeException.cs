namespace ExprModel.Web.Hosting;

/// <summary>An upload larger than <see cref="WebOptions.MaxUploadMegabytes"/>.</summary>
public sealed class UploadTooLargeException(string message) : Exception(message);
