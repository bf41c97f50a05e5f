using Bunit;
using ExprModel.Web.Components.Layout;
using Microsoft.AspNetCore.Components;

namespace ExprModel.Web.Tests.Components.Layout;

/// <summary>The layout marks whether the page is live, so the style sheet can hold back clicks a prerendered page would lose.</summary>
public sealed class MainLayoutTests : BunitContext
{
    [Theory]
    [InlineData("Static", false, "false")]
    [InlineData("Server", true, "true")]
    public void Marks_the_frame_live_only_once_the_circuit_renders(string renderer, bool interactive, string expected)
    {
        SetRendererInfo(new RendererInfo(renderer, interactive));
        var cut = Render<MainLayout>(p => p.Add(x => x.Body, (RenderFragment)(b => b.AddContent(0, "body"))));
        Assert.Equal(expected, cut.Find(".frame").GetAttribute("data-live"));
    }

    [Fact]
    public void The_style_sheet_holds_back_clicks_on_a_page_that_is_not_live()
    {
        string css = File.ReadAllText(Path.Combine(RepoRoot(), "wwwroot", "css", "exprmodel.css"));
        Assert.Contains(".frame[data-live=\"false\"] button { pointer-events: none;", css);
    }

    private static string RepoRoot()
    {
        for (var d = new DirectoryInfo(AppContext.BaseDirectory); d is not null; d = d.Parent)
            if (File.Exists(Path.Combine(d.FullName, "ExprModel.sln"))) return d.FullName;
        throw new DirectoryNotFoundException("ExprModel.sln not found above " + AppContext.BaseDirectory);
    }
}
