namespace ExprModel.Web.Apis;

/// <param name="Name">File name with its extension (.nwb, .csv, .tsv or .txt).</param>
public sealed record RecordingFileDto(string Name, string ContentBase64);
