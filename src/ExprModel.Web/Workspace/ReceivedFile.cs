namespace ExprModel.Web.Workspace;

/// <summary>
/// An uploaded file, or a file taken out of an uploaded archive, written to the upload's private temporary folder:
/// <see cref="Name"/> is how messages name it ("sample.tar.gz/filtered/barcodes.tsv.gz" for an archive entry),
/// <see cref="Path"/> where it lies now.
/// </summary>
public sealed record ReceivedFile(string Name, string Path)
{
    /// <summary>The last segment of <see cref="Name"/> (the entry's own file name).</summary>
    public string FileName => Name[(Name.LastIndexOf('/') + 1)..];
}
