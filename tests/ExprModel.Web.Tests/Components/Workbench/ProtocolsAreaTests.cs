using Bunit;
using ExprModel.Web.Components.Workbench;
using ExprModel.Web.Workspace;

// Not "...Components.Workbench": that namespace would hide the Workbench page type from the page tests beside this folder.
namespace ExprModel.Web.Tests.Components.WorkbenchParts;

/// <summary>The Workbench's protocols area with the real catalog and simulator (no browser; plots are not drawn).</summary>
public sealed class ProtocolsAreaTests : WorkbenchAreaContext
{
    private IRenderedComponent<ProtocolsArea> RenderArea()
    {
        var session = NewSession();
        session.OpenInitial("hh1952");
        return Render<ProtocolsArea>(p => p.Add(x => x.Session, session));
    }

    /// <summary>Each form shows its own settings, runs, and then shows its plots, its summary and its CSV button beside the caution.</summary>
    [Theory]
    [InlineData("pulse", new[] { "amplitude", "width" }, 1)]
    [InlineData("train", new[] { "amplitude", "width", "count", "frequency" }, 2)]
    [InlineData("ramp", new[] { "from", "to", "duration" }, 2)]
    [InlineData("noise", new[] { "mean", "sd", "tau", "duration", "seed" }, 2)]
    [InlineData("clamp", new[] { "holding", "from", "to", "increment", "command", "conditioning", "test" }, 3)]
    public void Each_form_shows_its_settings_and_runs_to_plots_and_a_csv(string kind, string[] fields, int plots)
    {
        var cut = RenderArea();
        Assert.Contains("Research use only", cut.Find("[data-testid=protocol-caution]").TextContent);
        cut.Find($"[data-testid=protocol-tab-{kind}]").Click();
        Assert.Equal(kind, cut.Find("[data-testid=protocol-form]").GetAttribute("data-kind"));
        Assert.Equal(fields, cut.FindAll("[data-testid^=protocol-field-]").Select(e => e.GetAttribute("data-testid")!["protocol-field-".Length..]));
        if (kind == "clamp") cut.Find("[data-testid=protocol-field-conditioning]").Change("100");
        cut.Find("[data-testid=protocol-run]").Click();
        cut.WaitForAssertion(() => Assert.NotEmpty(cut.FindAll("[data-testid=protocol-summary]")), Long);
        Assert.Equal(kind, cut.Find("[data-testid=protocol-summary]").GetAttribute("data-kind"));
        Assert.Equal(plots, cut.FindAll("figure.plot").Count);
        Assert.Contains(".csv", cut.Find("[data-testid=protocol-csv]").TextContent);
    }

    [Fact]
    public void The_waveform_form_takes_an_upload_and_names_the_line_and_column_of_a_bad_one()
    {
        var cut = RenderArea();
        cut.Find("[data-testid=protocol-tab-waveform]").Click();
        Assert.Empty(cut.FindAll("[data-testid^=protocol-field-]"));
        Assert.Contains("No waveform yet", cut.Find("[data-testid=protocol-waveform]").TextContent);
        var upload = cut.FindComponent<Microsoft.AspNetCore.Components.Forms.InputFile>();
        upload.UploadFiles(InputFileContent.CreateFromText("time_ms;current\n0;0\n5;abc\n", "bad.csv"));
        cut.WaitForAssertion(() => Assert.Contains("bad.csv: line 3, column 2: 'abc' is not a current.",
            cut.Find("[data-testid=protocols]").TextContent), Long);
        Assert.Contains("No waveform yet", cut.Find("[data-testid=protocol-waveform]").TextContent);
    }

    [Fact]
    public void An_uploaded_waveform_runs()
    {
        var cut = RenderArea();
        cut.Find("[data-testid=protocol-tab-waveform]").Click();
        cut.Find("[data-testid=protocol-waveform-unit]").Change("density");
        var upload = cut.FindComponent<Microsoft.AspNetCore.Components.Forms.InputFile>();
        upload.UploadFiles(InputFileContent.CreateFromText("time_ms,current\n0,0\n50,0\n51,30\n150,30\n151,0\n200,0\n", "w.csv"));
        cut.WaitForAssertion(() => Assert.Contains("w.csv: 6 samples", cut.Find("[data-testid=protocol-waveform]").TextContent), Long);
        cut.Find("[data-testid=protocol-run]").Click();
        cut.WaitForAssertion(() => Assert.NotEmpty(cut.FindAll("[data-testid=protocol-summary]")), Long);
        Assert.Contains("spike", cut.Find("[data-testid=protocol-summary]").TextContent);
        Assert.Equal(2, cut.FindAll("figure.plot").Count);
    }
}
