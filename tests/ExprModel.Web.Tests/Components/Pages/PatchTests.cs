using Bunit;
using ExprModel.Data.Catalog;
using ExprModel.Web.Components.Pages;
using ExprModel.Web.Hosting;
using ExprModel.Web.Simulation;
using Microsoft.Extensions.DependencyInjection;
using Microsoft.Extensions.Options;

namespace ExprModel.Web.Tests.Components.Pages;

/// <summary>The Patch page with the real catalog and simulation (no browser; plots are not drawn).</summary>
public sealed class PatchTests : BunitContext
{
    private readonly string _dir = Path.Combine(Path.GetTempPath(), "exprmodel-bunit-patch-" + Guid.NewGuid().ToString("N"));

    public PatchTests()
    {
        JSInterop.Mode = JSRuntimeMode.Loose;
        Directory.CreateDirectory(_dir);
        Services.AddSingleton(Options.Create(new WebOptions()));
        Services.AddSingleton(CatalogLocator.Ensure(Path.Combine(_dir, "catalog.db")));
        Services.AddSingleton<SimulationGate>();
        Services.AddSingleton<ModelRunner>();
    }

    protected override void Dispose(bool disposing)
    {
        base.Dispose(disposing);
        if (disposing && Directory.Exists(_dir)) Directory.Delete(_dir, recursive: true);
    }

    [Fact]
    public void Before_a_run_the_form_and_the_catalog_conductance_are_shown_without_plots()
    {
        var cut = Render<Patch>();
        Assert.Contains("squid-na-hh1952", cut.Find("[data-testid=patch-entry]").InnerHtml);
        Assert.Contains("Sigworth", cut.Find("[data-testid=patch-unitary-source]").TextContent);
        Assert.Empty(cut.FindAll("[data-testid=patch-summary]"));
    }

    [Fact]
    public void A_run_shows_the_caution_summary_fit_and_five_plots()
    {
        var cut = Render<Patch>();
        cut.Find("[data-testid=patch-sweeps]").Change("40");
        cut.Find("[data-testid=patch-run]").Click();
        cut.WaitForAssertion(() => Assert.NotEmpty(cut.FindAll("[data-testid=patch-summary]")), TimeSpan.FromSeconds(60));
        Assert.Contains("Research use only", cut.Find("[data-testid=caution]").TextContent);
        Assert.Equal(5, cut.FindAll("figure.plot").Count);
        Assert.Contains("N =", cut.Find("[data-testid=patch-fit]").TextContent);
    }

    [Fact]
    public void A_bad_field_is_an_error_naming_it()
    {
        var cut = Render<Patch>();
        cut.Find("[data-testid=patch-channels]").Change("0");
        cut.Find("[data-testid=patch-run]").Click();
        cut.WaitForAssertion(() => Assert.Contains("channels", cut.Find("[data-testid=error]").TextContent), TimeSpan.FromSeconds(30));
    }
}
