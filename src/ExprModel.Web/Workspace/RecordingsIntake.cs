using ExprModel.Core.Mapping;
using ExprModel.Core.Recordings;
using ExprModel.Web.Simulation;

namespace ExprModel.Web.Workspace;

/// <summary>
/// The Load page's recordings panel without its markup: uploads of recorded sweeps and of a recorded-features table
/// into the workspace's <see cref="RecordedData"/>, the metadata table as the default features table, the demo
/// recordings, and the column match the user edits. <paramref name="changed"/> is called whenever something shown changed.
/// </summary>
public sealed class RecordingsIntake(WorkspaceState workspace, Func<Task> changed)
{
    public RecordedData Recorded => workspace.Recorded;
    public bool Busy { get; private set; }
    /// <summary>The last problem, as the library reported it (file and dataset path or line).</summary>
    public string? Error { get; private set; }

    /// <summary>Reads and measures uploaded sweep families (NWB files, trace tables); a bad file changes nothing.</summary>
    public Task AddSweepsAsync(IReadOnlyList<UploadedFile> files) => Guarded(async () =>
    {
        var cells = await Task.Run(() => RecordingUploads.ReadSweeps(files));
        await Task.Run(() => Recorded.AddSweeps(cells));
    });

    /// <summary>Reads the demo's recordings folder (one NWB file per cell).</summary>
    public Task AddDemoSweepsAsync(string directory) => Guarded(async () =>
    {
        IReadOnlyList<RecordedCell> cells;
        try { cells = await Task.Run(() => RecordingReader.Read(directory)); }
        catch (RecordingFormatException e) { throw new UserInputException(e.Message); }
        await Task.Run(() => Recorded.AddSweeps(cells));
    });

    /// <summary>An uploaded recorded-features table replaces the metadata table as the source of recorded values.</summary>
    public Task UseFeatureTableAsync(UploadedFile file) => Guarded(async () =>
    {
        var table = await Task.Run(() => RecordingUploads.ReadFeatureTable(file));
        Recorded.UseTable(table, isMetadata: false);
    });

    /// <summary>
    /// The metadata table's recorded columns (units in the headers) are the default recorded values; an uploaded
    /// features table takes precedence. A metadata table that cannot be read as one is reported here only.
    /// </summary>
    public Task UseMetadataAsync(UploadedFile metadata) => Recorded.Table is not null && !Recorded.TableIsMetadata ? Task.CompletedTask : Guarded(async () =>
    {
        var table = await Task.Run(() => RecordingUploads.ReadFeatureTable(metadata));
        Recorded.UseTable(table, isMetadata: true);
    });

    /// <summary>Shows <paramref name="message"/> (an upload refused before reading).</summary>
    public Task Refuse(string message)
    {
        Error = message;
        return changed();
    }

    public void Choose(string header, string readout) => Guard(() => Recorded.Choose(header, readout));

    public void ClearSweeps() { Recorded.ClearSweeps(); Error = null; _ = changed(); }

    public void ClearTable() { Recorded.ClearTable(); Error = null; _ = changed(); }

    /// <summary>Ties the recorded data to the table just read; false (with <see cref="Error"/>) when a recorded cell is not in it.</summary>
    public bool MatchTo(ExpressionDataset data)
    {
        try { Recorded.Match(data); Error = null; return true; }
        catch (UserInputException e) { Error = e.Message; return false; }
    }

    private void Guard(Action act)
    {
        try { act(); Error = null; }
        catch (UserInputException e) { Error = e.Message; }
        _ = changed();
    }

    private async Task Guarded(Func<Task> act)
    {
        Busy = true;
        Error = null;
        await changed();
        try { await act(); }
        catch (UserInputException e) { Error = e.Message; }
        finally { Busy = false; }
        await changed();
    }
}
