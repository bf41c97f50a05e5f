using ExprModel.Data.Catalog;
using ExprModel.Web.Workspace;

namespace ExprModel.Web.Tests.Workspace;

/// <summary>
/// The Load page's recordings state on the shipped demo (catalog/demo/README.md: 15 cells with NWB recordings, recorded
/// columns in metadata.csv).
/// </summary>
public sealed class RecordingsIntakeTests
{
    private static readonly string Demo = Path.Combine(CatalogLocator.FindSourceDirectory()!, "demo");

    [Fact]
    public async Task The_demo_recordings_and_the_metadatas_recorded_columns_are_read_and_matched()
    {
        var workspace = new WorkspaceState();
        var intake = new RecordingsIntake(workspace, () => Task.CompletedTask);
        await intake.AddDemoSweepsAsync(Path.Combine(Demo, "recordings"));
        Assert.Null(intake.Error);
        Assert.Equal(15, workspace.Recorded.Cells.Count);
        await intake.UseMetadataAsync(new UploadedFile("metadata.csv", File.ReadAllBytes(Path.Combine(Demo, "metadata.csv"))));
        Assert.Null(intake.Error);
        var match = workspace.Recorded.Features!.Matches.Single(m => m.Header == "rheobase (pA)");
        Assert.Equal("rheobase_absolute", match.Readout);
        Assert.False(workspace.Recorded.Features.Matches.Single(m => m.Header == "max firing rate (Hz)").Matched);
    }

    [Fact]
    public async Task A_bad_recording_is_reported_with_its_file_and_dataset_path_and_changes_nothing()
    {
        var workspace = new WorkspaceState();
        var intake = new RecordingsIntake(workspace, () => Task.CompletedTask);
        // An HDF5 signature is not enough: a truncated copy of a demo file must be refused with its name, never crash.
        var bytes = File.ReadAllBytes(Path.Combine(Demo, "recordings", "FH1001.nwb"))[..4096];
        await intake.AddSweepsAsync([new UploadedFile("cut short.nwb", bytes)]);
        Assert.NotNull(intake.Error);
        Assert.Contains("cut_short.nwb", intake.Error);
        Assert.Empty(workspace.Recorded.Cells);

        // A trace table without a unit in its voltage header: file, line and column.
        await intake.AddSweepsAsync([new UploadedFile("c1_sweep_1.csv", "time (ms),V,I (pA)\n0,-70,0\n"u8.ToArray())]);
        Assert.Contains("c1_sweep_1.csv: line 1, column 2", intake.Error);
        Assert.Empty(workspace.Recorded.Cells);
    }

    [Fact]
    public void One_sweep_files_sent_together_make_one_cell_named_by_what_their_names_share()
    {
        Assert.Equal("FH1001", RecordingUploads.SharedStem(["FH1001_sweep_01", "FH1001_sweep_02", "FH1001_sweep_13"]));
        Assert.Equal("cellA", RecordingUploads.SharedStem(["cellA-3"]));
    }
}
