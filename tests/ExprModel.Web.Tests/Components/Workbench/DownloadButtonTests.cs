using Bunit;
using ExprModel.Web.Components.Workbench;
using ExprModel.Web.Export;
using Microsoft.AspNetCore.Components;

namespace ExprModel.Web.Tests.Components.WorkbenchParts;

/// <summary>A prerendered page has no event handlers yet: its download buttons must say so (disabled), not lose the click.</summary>
public sealed class DownloadButtonTests : BunitContext
{
    private IRenderedComponent<DownloadButton> RenderButton() => Render<DownloadButton>(p => p
        .Add(x => x.Label, "methods paragraph").Add(x => x.TestId, "m")
        .Add(x => x.File, () => new DownloadFile("m.txt", "text/plain", "text")));

    [Fact]
    public void Is_disabled_while_the_page_is_only_prerendered()
    {
        SetRendererInfo(new RendererInfo("Static", isInteractive: false));
        Assert.True(RenderButton().Find("button").HasAttribute("disabled"));
    }

    [Fact]
    public void Is_enabled_and_downloads_once_the_page_is_live()
    {
        SetRendererInfo(new RendererInfo("Server", isInteractive: true));
        JSInterop.SetupVoid("exprModel.download", "m.txt", "text/plain", "text");
        var cut = RenderButton();
        Assert.False(cut.Find("button").HasAttribute("disabled"));
        cut.Find("button").Click();
        Assert.Single(JSInterop.Invocations, i => i.Identifier == "exprModel.download");
    }
}
