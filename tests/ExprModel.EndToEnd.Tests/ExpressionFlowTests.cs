using Microsoft.Playwright;

namespace ExprModel.EndToEnd.Tests;

/// <summary>From the demo survey to a group's model on the Workbench; a bad file is reported where it was loaded.</summary>
[Collection("app")]
public sealed class ExpressionFlowTests(AppFixture app)
{
    [Fact]
    public async Task Demo_to_a_groups_model_whose_readouts_follow_a_slider()
    {
        var (context, page, errors) = await app.NewPageAsync();
        await app.GotoAsync(page, "/load");
        await page.Locator("[data-testid=use-demo]").ClickAsync();
        await page.WaitForSelectorAsync("[data-testid=preview]");
        Assert.Contains("FH1001", await page.Locator("[data-testid=preview] tr.head").InnerTextAsync());
        Assert.Contains("Scn1a", await page.Locator("[data-testid=preview]").InnerTextAsync());
        Assert.Equal("group", await page.Locator("[data-testid=group-column]").InputValueAsync());
        await app.ScreenshotAsync(page, "load-demo");

        await page.Locator("[data-testid=to-map]").ClickAsync();
        await page.WaitForSelectorAsync("[data-testid=mapping-table]");
        Assert.Contains("240 cells", await page.Locator("[data-testid=table-summary]").InnerTextAsync());
        Assert.True(await page.Locator("[data-testid=mapping-table] tbody tr").CountAsync() > 5);
        Assert.True(await page.Locator("[data-testid=unmapped-table] tbody tr").CountAsync() > 0);

        // An override: exclude one gene; the page notes it.
        var firstGene = await page.Locator("[data-testid=mapping-table] tbody tr").First.GetAttributeAsync("data-gene");
        await page.Locator($"[data-testid=exclude-{firstGene}]").CheckAsync();
        await page.WaitForSelectorAsync($"tr.excluded[data-gene={firstGene}]");
        await page.Locator($"[data-testid=exclude-{firstGene}]").UncheckAsync();
        await page.WaitForSelectorAsync($"tr[data-gene={firstGene}]:not(.excluded)");

        await page.Locator("[data-testid=build]").ClickAsync();
        await page.WaitForSelectorAsync("[data-testid=built] tr[data-built=T1-fast]");
        Assert.Equal(5, await page.Locator("[data-testid=built] tbody tr").CountAsync());
        await app.ScreenshotAsync(page, "map-built");

        await page.Locator("[data-testid=open-T1-fast]").ClickAsync();
        await WorkbenchTests.WaitForUpdateAfter(page, 0);
        Assert.Contains("T1-fast", await page.Locator("[data-testid=model-name]").InnerTextAsync());
        var before = await WorkbenchTests.ReadoutValues(page);
        int count = await WorkbenchTests.UpdateCount(page);
        var slider = page.Locator(".density-slider input[type=range]").First;
        await slider.FillAsync("300");
        await WorkbenchTests.WaitForUpdateAfter(page, count);
        Assert.NotEqual(before, await WorkbenchTests.ReadoutValues(page));
        await page.WaitForTimeoutAsync(1500);
        await app.ScreenshotAsync(page, "workbench-group");
        Assert.Empty(errors);
        await context.CloseAsync();
    }

    [Fact]
    public async Task Groups_can_be_compared_on_the_workbench()
    {
        var (context, page, errors) = await app.NewPageAsync();
        page.SetDefaultTimeout(120_000);
        await app.GotoAsync(page, "/load");
        await page.Locator("[data-testid=use-demo]").ClickAsync();
        await page.Locator("[data-testid=to-map]").ClickAsync();
        await page.Locator("[data-testid=build]").ClickAsync();
        await page.Locator("[data-testid=compare-on-workbench]").ClickAsync();
        await page.WaitForFunctionAsync("() => document.querySelectorAll('[data-testid=readouts] thead th').length >= 7", null, new() { Timeout = 120_000 });
        await page.WaitForTimeoutAsync(1500);
        await app.ScreenshotAsync(page, "workbench-compare-groups");
        Assert.Empty(errors);
        await context.CloseAsync();
    }

    [Fact]
    public async Task Read_outs_for_every_cell_are_summarised_by_group_and_exported_per_cell()
    {
        var (context, page, errors) = await app.NewPageAsync();
        page.SetDefaultTimeout(180_000);
        await app.GotoAsync(page, "/load");
        await page.Locator("[data-testid=use-demo]").ClickAsync();
        await page.Locator("[data-testid=to-map]").ClickAsync();
        await page.Locator("[data-testid=build]").ClickAsync();
        await page.Locator("[data-testid=cell-batch]").ClickAsync();
        await page.WaitForSelectorAsync("[data-testid=cell-batch-progress]");
        await page.WaitForSelectorAsync("[data-testid=cell-batch-csv]");
        Assert.Equal(5, await page.Locator("[data-testid=cell-batch-summary] tbody tr").CountAsync());
        Assert.Contains("Research use only", await page.Locator("[data-testid=cell-batch-card]").InnerTextAsync());
        await app.ScreenshotAsync(page, "map-every-cell");

        var download = await page.RunAndWaitForDownloadAsync(() => page.Locator("[data-testid=cell-batch-csv]").ClickAsync());
        var lines = (await File.ReadAllTextAsync((await download.PathAsync())!)).Split('\n', StringSplitOptions.RemoveEmptyEntries);
        Assert.StartsWith("# Research tool.", lines[0]);
        var header = lines.First(l => !l.StartsWith('#'));
        Assert.StartsWith("item_index,item,group,cells,resting_potential_mv,", header);
        var rows = lines.SkipWhile(l => l != header).Skip(1).ToArray();
        Assert.Equal(240, rows.Length); // the demo survey's cells (catalog/demo/metadata.csv)
        Assert.Contains(rows, r => r.Split(',')[2] == "T3-bursting");
        Assert.Empty(errors);
        await context.CloseAsync();
    }

    private static string DemoMtx(string file) => Demo("mtx", file);

    private static string Demo(string folder, string file)
    {
        for (var d = new DirectoryInfo(AppContext.BaseDirectory); d is not null; d = d.Parent)
            if (File.Exists(Path.Combine(d.FullName, "ExprModel.sln"))) return Path.Combine(d.FullName, "catalog", "demo", folder, file);
        throw new FileNotFoundException(file);
    }

    [Fact]
    public async Task A_matrix_market_triple_chosen_together_or_in_an_archive_is_sorted_and_read()
    {
        var (context, page, errors) = await app.NewPageAsync();
        await app.GotoAsync(page, "/load");
        // The three files of catalog/demo/mtx chosen at once, in no particular order.
        await page.Locator("[data-testid=upload-expression]").SetInputFilesAsync(new[] { "barcodes.tsv", "matrix.mtx", "genes.tsv" }.Select(DemoMtx));
        var parts = await page.WaitForSelectorAsync("[data-testid=upload-parts]");
        Assert.Contains("× 240 cells (named by barcodes.tsv)", await parts!.InnerTextAsync());
        Assert.Contains("column (cell)", await page.Locator("[data-testid=preview]").InnerTextAsync());
        await app.ScreenshotAsync(page, "load-matrix-market");

        // Only two of them: the missing one is named at once.
        await page.Locator("[data-testid=upload-expression]").SetInputFilesAsync(new[] { "matrix.mtx", "genes.tsv" }.Select(DemoMtx));
        await page.WaitForFunctionAsync("() => document.querySelector('[data-testid=error]')?.innerText.includes('came without its cells file')");
        await app.ScreenshotAsync(page, "load-matrix-market-missing");

        // The same three in a tar.gz archive, then read and on to mapping.
        var archive = Path.Combine(app.WorkDir, "sample.tar.gz");
        await using (var output = File.Create(archive))
        await using (var gz = new System.IO.Compression.GZipStream(output, System.IO.Compression.CompressionLevel.Optimal))
        await using (var tar = new System.Formats.Tar.TarWriter(gz))
            foreach (var f in new[] { "matrix.mtx", "genes.tsv", "barcodes.tsv" }) await tar.WriteEntryAsync(DemoMtx(f), "sample/" + f);
        await page.Locator("[data-testid=upload-expression]").SetInputFilesAsync(archive);
        await page.WaitForFunctionAsync(
            "() => document.querySelector('[data-testid=upload-parts]')?.innerText.includes('sample.tar.gz/sample/matrix.mtx')");
        await page.Locator("[data-testid=to-map]").ClickAsync();
        await page.WaitForSelectorAsync("[data-testid=mapping-table]");
        Assert.Contains("240 cells", await page.Locator("[data-testid=table-summary]").InnerTextAsync());
        await app.ScreenshotAsync(page, "map-matrix-market");
        Assert.True(errors.Count == 0, string.Join("\n", errors));
        await context.CloseAsync();
    }

    [Fact]
    public async Task An_h5ad_with_log_values_in_X_shows_the_hint_and_its_counts_layer_is_read_with_one_click()
    {
        var (context, page, errors) = await app.NewPageAsync();
        await app.GotoAsync(page, "/load");
        // catalog/demo/h5ad/demo.h5ad: ln(1 + 1e4 x count / library) in X, the counts in layers/counts.
        await page.Locator("[data-testid=upload-expression]").SetInputFilesAsync(Demo("h5ad", "demo.h5ad"));
        var hint = await page.WaitForSelectorAsync("[data-testid=matrix-hint]");
        Assert.Contains("demo.h5ad: dataset /X: values look log-transformed", await hint!.InnerTextAsync());
        Assert.Contains("use --matrix layer:counts", await hint.InnerTextAsync());
        Assert.Contains("240 cells (obs) × 558 genes (var)", await page.Locator("[data-testid=upload-parts]").InnerTextAsync());
        Assert.Equal(["", "layer:counts"], await page.Locator("[data-testid=matrix] option").EvaluateAllAsync<string[]>("os => os.map(o => o.value)"));
        await app.ScreenshotAsync(page, "load-h5ad-hint");

        await page.Locator("[data-testid=use-suggested-matrix]").ClickAsync();
        await page.WaitForSelectorAsync("[data-testid=matrix-chosen]");
        Assert.Equal("layer:counts", await page.Locator("[data-testid=matrix]").InputValueAsync());
        Assert.Equal(0, await page.Locator("[data-testid=matrix-hint]").CountAsync());
        await app.ScreenshotAsync(page, "load-h5ad-counts-chosen");

        await page.Locator("[data-testid=to-map]").ClickAsync();
        await page.WaitForSelectorAsync("[data-testid=mapping-table]");
        var summary = await page.Locator("[data-testid=table-summary]").InnerTextAsync();
        Assert.Contains("240 cells", summary);
        await app.ScreenshotAsync(page, "map-h5ad");
        Assert.True(errors.Count == 0, string.Join("\n", errors));
        await context.CloseAsync();
    }

    [Fact]
    public async Task A_bad_file_shows_where_it_is_wrong()
    {
        var (context, page, errors) = await app.NewPageAsync();
        await app.GotoAsync(page, "/load");
        await page.Locator("[data-testid=upload-expression]").SetInputFilesAsync(Path.Combine(AppContext.BaseDirectory, "data", "ragged.csv"));
        await page.WaitForSelectorAsync("[data-testid=preview]");
        await page.Locator("[data-testid=to-map]").ClickAsync();
        var error = await page.WaitForSelectorAsync("[data-testid=error]");
        var text = await error!.InnerTextAsync();
        Assert.Contains("ragged.csv", text);
        Assert.Contains("line 3", text);
        await app.ScreenshotAsync(page, "load-bad-file");

        // Binary garbage is refused at once, before any reading.
        var garbage = Path.Combine(app.WorkDir, "garbage.csv");
        await File.WriteAllBytesAsync(garbage, [0x50, 0x4b, 0x03, 0x04, 0x00, 0x00, 0xff, 0xfe]);
        await page.Locator("[data-testid=upload-expression]").SetInputFilesAsync(garbage);
        await page.WaitForFunctionAsync("() => document.querySelector('[data-testid=error]')?.innerText.includes('NUL')");

        // Over the upload limit (1 MB in the test configuration).
        var big = Path.Combine(app.WorkDir, "big.csv");
        await File.WriteAllTextAsync(big, "gene,c1\n" + string.Concat(Enumerable.Range(0, 120_000).Select(i => $"G{i},{i}\n")));
        await page.Locator("[data-testid=upload-expression]").SetInputFilesAsync(big);
        await page.WaitForFunctionAsync("() => document.querySelector('[data-testid=error]')?.innerText.includes('upload limit')");
        Assert.Empty(errors);
        await context.CloseAsync();
    }
}
