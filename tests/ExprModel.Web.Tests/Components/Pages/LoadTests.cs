using Bunit;
using ExprModel.Data.Catalog;
using ExprModel.Web.Components.Pages;
using ExprModel.Web.Hosting;
using ExprModel.Web.Tests.Workspace;
using ExprModel.Web.Workspace;
using Microsoft.AspNetCore.Components.Forms;
using Microsoft.Extensions.DependencyInjection;
using Microsoft.Extensions.Options;

namespace ExprModel.Web.Tests.Components.Pages;

/// <summary>The Load page with the real catalog: Matrix Market uploads (several files or one archive), AnnData uploads and the build queue.</summary>
public sealed class LoadTests : BunitContext
{
    private readonly string _dir = Path.Combine(Path.GetTempPath(), "exprmodel-bunit-load-" + Guid.NewGuid().ToString("N"));
    private readonly WorkspaceState _workspace = new();
    private readonly BuildQueue _queue;

    public LoadTests()
    {
        JSInterop.Mode = JSRuntimeMode.Loose;
        Directory.CreateDirectory(_dir);
        // One build at a time and none waiting, so a test can hold the only slot.
        var options = Options.Create(new WebOptions { MaxConcurrentBuilds = 1, MaxQueuedBuilds = 0 });
        _queue = new BuildQueue(options);
        Services.AddSingleton(options);
        Services.AddSingleton(CatalogLocator.Ensure(Path.Combine(_dir, "catalog.db")));
        Services.AddSingleton(_workspace);
        Services.AddSingleton(new DemoData(options));
        Services.AddSingleton(_queue);
    }

    protected override void Dispose(bool disposing)
    {
        base.Dispose(disposing);
        if (disposing && Directory.Exists(_dir)) Directory.Delete(_dir, recursive: true);
    }

    private static InputFileContent Demo(string file) => InputFileContent.CreateFromBinary(File.ReadAllBytes(MatrixMarketPartsTests.DemoMtx(file)), file);

    private void Upload(IRenderedComponent<Load> cut, params InputFileContent[] files) =>
        cut.FindComponents<InputFile>().First(c => c.Instance.AdditionalAttributes?["data-testid"] as string == "upload-expression").UploadFiles(files);

    [Fact]
    public void Three_chosen_files_are_sorted_into_matrix_and_sidecars_and_read_on_continue()
    {
        var cut = Render<Load>();
        Upload(cut, Demo("genes.tsv"), Demo("matrix.mtx"), Demo("barcodes.tsv"));
        cut.WaitForAssertion(() => Assert.Contains("× 240 cells (named by barcodes.tsv)", cut.Find("[data-testid=upload-parts]").TextContent));
        Assert.Contains("genes.tsv + matrix.mtx + barcodes.tsv", cut.Find(".preview h2").TextContent);
        Assert.Contains("column (cell)", cut.Find("[data-testid=preview]").TextContent);
        Assert.Equal(3, _workspace.ExpressionFiles.Count);
        Assert.Equal(WorkspaceState.PackedName, _workspace.ExpressionName);

        cut.Find("[data-testid=to-map]").Click();
        cut.WaitForAssertion(() => Assert.NotNull(_workspace.Session), TimeSpan.FromSeconds(60));
        Assert.Equal(240, _workspace.Session!.Dataset.Table.CellIds.Count);
        Assert.Equal(0, _queue.Admitted); // the slot was handed back
    }

    [Fact]
    public void A_missing_sidecar_is_named_on_upload_and_nothing_is_kept()
    {
        var cut = Render<Load>();
        Upload(cut, Demo("matrix.mtx"), Demo("genes.tsv"));
        cut.WaitForAssertion(() => Assert.Contains("matrix.mtx came without its cells file", cut.Find("[data-testid=error]").TextContent));
        Assert.Empty(_workspace.ExpressionFiles);
    }

    [Fact]
    public void An_archive_is_previewed_with_its_parts()
    {
        var zip = UploadArchiveTests.Zip([.. new[] { "matrix.mtx", "genes.tsv", "barcodes.tsv" }
            .Select(f => ("run/" + f, File.ReadAllBytes(MatrixMarketPartsTests.DemoMtx(f))))]);
        var cut = Render<Load>();
        Upload(cut, InputFileContent.CreateFromBinary(zip, "run.zip"));
        cut.WaitForAssertion(() => Assert.True(cut.FindAll("[data-testid=upload-parts]").Count > 0, cut.Markup[..Math.Min(3000, cut.Markup.Length)]));
        Assert.Contains("Matrix Market matrix run.zip/run/matrix.mtx", cut.Find("[data-testid=upload-parts]").TextContent);
    }

    [Fact]
    public void An_h5ad_upload_lists_its_matrices_and_the_hint_picks_the_counts_layer_that_is_then_read()
    {
        var cut = Render<Load>();
        Upload(cut, InputFileContent.CreateFromBinary(File.ReadAllBytes(LoadPanels.MatrixPickerTests.DemoH5ad()), "demo.h5ad"));
        cut.WaitForAssertion(() => Assert.Contains("240 cells (obs) × 558 genes (var); 2 matrices", cut.Find("[data-testid=upload-parts]").TextContent));
        Assert.Contains("layer:counts", cut.Find("[data-testid=preview]").TextContent);
        Assert.Empty(cut.FindAll("[data-testid=orientation]")); // fixed by the AnnData layout

        // Read as it is, X is refused with the hint (file, dataset and the matrix to use named).
        cut.Find("[data-testid=to-map]").Click();
        cut.WaitForAssertion(() => Assert.Contains("demo.h5ad: dataset /X: values look log-transformed", cut.Find("[data-testid=error]").TextContent),
            TimeSpan.FromSeconds(60));
        Assert.Null(_workspace.Session);
        Assert.Contains("use --matrix layer:counts", cut.Find("[data-testid=matrix-hint]").TextContent);

        cut.Find("[data-testid=use-suggested-matrix]").Click();
        Assert.Equal("layer:counts", _workspace.Intake.Matrix);
        cut.Find("[data-testid=to-map]").Click();
        cut.WaitForAssertion(() => Assert.NotNull(_workspace.Session), TimeSpan.FromSeconds(60));
        Assert.Equal("layer:counts", _workspace.Session!.Choices.Matrix);
        Assert.Equal(240, _workspace.Session.Dataset.Table.CellIds.Count);
        Assert.Equal(ExprModel.Core.Expression.ExpressionUnit.Counts, _workspace.Session.Dataset.Table.Unit);
    }

    [Fact]
    public void A_new_upload_forgets_the_matrix_chosen_for_the_last_one()
    {
        _workspace.Intake.Matrix = "layer:spliced";
        var cut = Render<Load>();
        Upload(cut, InputFileContent.CreateFromBinary(File.ReadAllBytes(LoadPanels.MatrixPickerTests.DemoH5ad()), "demo.h5ad"));
        cut.WaitForAssertion(() => cut.Find("[data-testid=matrix-hint]"));
        Assert.Equal("", _workspace.Intake.Matrix);
    }

    [Fact]
    public void A_file_named_h5ad_that_is_not_hdf5_is_refused_on_upload_naming_it()
    {
        var cut = Render<Load>();
        Upload(cut, InputFileContent.CreateFromText("gene,c1\nKcnc1,3\n", "atlas.h5ad"));
        cut.WaitForAssertion(() => Assert.Contains("atlas.h5ad: byte 0: not an HDF5 file", cut.Find("[data-testid=error]").TextContent));
        Assert.Empty(_workspace.ExpressionFiles);
    }

    [Fact]
    public async Task When_the_build_queue_is_full_reading_says_the_server_is_busy_and_keeps_the_upload()
    {
        var cut = Render<Load>();
        Upload(cut, Demo("matrix.mtx"), Demo("genes.tsv"), Demo("barcodes.tsv"));
        cut.WaitForAssertion(() => cut.Find("[data-testid=upload-parts]"));
        using (await _queue.EnterAsync(CancellationToken.None))
        {
            cut.Find("[data-testid=to-map]").Click();
            cut.WaitForAssertion(() => Assert.Contains("The server is building other tables", cut.Find("[data-testid=error]").TextContent));
            Assert.Contains("The server is busy", cut.Find("[data-testid=error] strong").TextContent);
            Assert.Null(_workspace.Session);
            Assert.Equal(3, _workspace.ExpressionFiles.Count);
        }
        cut.Find("[data-testid=to-map]").Click();
        cut.WaitForAssertion(() => Assert.NotNull(_workspace.Session), TimeSpan.FromSeconds(60));
    }
}
