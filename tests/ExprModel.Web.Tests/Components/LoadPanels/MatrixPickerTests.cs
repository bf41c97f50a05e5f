using Bunit;
using ExprModel.Core.Expression;
using ExprModel.Core.Expression.AnnData;
using ExprModel.Web.Components.LoadPanels;

namespace ExprModel.Web.Tests.Components.LoadPanels;

/// <summary>
/// The AnnData matrix choice on the Load page, on the committed demo file (log-normalised X, counts in layers/counts):
/// it lists the file's matrices in the CLI's spellings and shows the reader's own refusal text as the hint, word for word,
/// with one button that picks the counts layer.
/// </summary>
public sealed class MatrixPickerTests : BunitContext
{
    internal static string DemoH5ad()
    {
        for (var d = new DirectoryInfo(AppContext.BaseDirectory); d is not null; d = d.Parent)
        {
            var f = Path.Combine(d.FullName, "catalog", "demo", "h5ad", "demo.h5ad");
            if (File.Exists(f)) return f;
        }
        throw new FileNotFoundException("catalog/demo/h5ad/demo.h5ad");
    }

    private static readonly AnnDataOverview Demo = AnnDataReader.Describe(DemoH5ad());

    [Fact]
    public void Lists_the_files_matrices_and_picks_the_counts_layer_from_the_hint_in_one_click()
    {
        string? picked = null;
        var cut = Render<MatrixPicker>(p => p.Add(c => c.Overview, Demo).Add(c => c.Value, "").Add(c => c.ValueChanged, v => picked = v));
        var options = cut.FindAll("[data-testid=matrix] option");
        Assert.Equal(["", "layer:counts"], options.Select(o => o.GetAttribute("value")));
        Assert.Equal(["X (the main matrix)", "layer:counts (layers/counts)"], options.Select(o => o.TextContent));

        // The hint is what the reader (and so the CLI) says when it refuses X without a matrix chosen.
        var refusal = Assert.Throws<ExpressionFormatException>(() => ExpressionReader.Read(DemoH5ad(),
            new ExpressionReadOptions { KeepGene = g => g != "Malat1" }));
        Assert.Equal(refusal.Message, cut.Find("[data-testid=matrix-hint] p").TextContent);
        Assert.Contains("use --matrix layer:counts", refusal.Message);

        cut.Find("[data-testid=use-suggested-matrix]").Click();
        Assert.Equal("layer:counts", picked);
        Assert.Empty(cut.FindAll("[data-testid=matrix-hint]"));
        Assert.Equal("Values are read from /layers/counts (matrix 'layer:counts').", cut.Find("[data-testid=matrix-chosen]").TextContent);
    }

    [Fact]
    public void Choosing_in_the_list_reports_the_spelling_and_X_sends_none()
    {
        var values = new List<string>();
        var cut = Render<MatrixPicker>(p => p.Add(c => c.Overview, Demo).Add(c => c.Value, "").Add(c => c.ValueChanged, v => values.Add(v)));
        cut.Find("[data-testid=matrix]").Change("layer:counts");
        cut.Find("[data-testid=matrix]").Change("");
        Assert.Equal(["layer:counts", ""], values);
        Assert.NotEmpty(cut.FindAll("[data-testid=matrix-hint]"));
    }

    [Theory]
    [InlineData("counts")] // a stated unit: the reader no longer judges X's look, so neither does the page
    [InlineData("log-transformed")] // a stated transform is undone by the reader
    public void A_stated_unit_turns_the_hint_off(string unit)
    {
        var cut = Render<MatrixPicker>(p => p.Add(c => c.Overview, Demo).Add(c => c.Value, "").Add(c => c.Unit, unit));
        Assert.Empty(cut.FindAll("[data-testid=matrix-hint]"));
    }

    [Fact]
    public void A_file_whose_X_holds_counts_shows_no_hint()
    {
        var counts = Demo with { Hint = null, Suggested = null };
        var cut = Render<MatrixPicker>(p => p.Add(c => c.Overview, counts).Add(c => c.Value, ""));
        Assert.Empty(cut.FindAll("[data-testid=matrix-hint]"));
        Assert.Empty(cut.FindAll("[data-testid=matrix-chosen]"));
    }
}
