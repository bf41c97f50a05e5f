using Bunit;
using ExprModel.Core.Perturbation;
using ExprModel.Data.Catalog;
using ExprModel.Web.Components.Workbench;
using ExprModel.Web.Workspace;

// Not "...Components.Workbench": that namespace would hide the Workbench page type from the page tests beside this folder.
namespace ExprModel.Web.Tests.Components.WorkbenchParts;

/// <summary>The Workbench's "why and what-if" area with the real catalog, simulator and library (no browser; plots are not drawn).</summary>
public sealed class WhatIfAreaTests : WorkbenchAreaContext
{
    private IRenderedComponent<WhatIfArea> Render(Action<WorkbenchSession> open, IReadOnlyList<FitTarget>? recorded = null)
    {
        var session = NewSession();
        open(session);
        return Render<WhatIfArea>(p => p.Add(x => x.Session, session).Add(x => x.RecordedTargets, recorded));
    }

    [Fact]
    public void Which_entries_set_the_rheobase_of_a_preset_shows_the_tornado_and_the_ranked_table()
    {
        var cut = Render(s => s.OpenInitial("cortex-rs2008"));
        Assert.Contains("Research use only", cut.Find("[data-testid=whatif-caution]").TextContent);
        // A published model records no genes: entries only.
        Assert.Empty(cut.FindAll("[data-testid=kd-genes]"));
        var button = cut.Find("[data-testid=kd-rheobase]");
        Assert.Equal("Which entries set the rheobase?", button.TextContent);
        button.Click();
        cut.WaitForAssertion(() => Assert.NotEmpty(cut.FindAll("[data-testid=tornado]")), Long);
        var tornado = cut.Find("[data-testid=tornado]");
        Assert.Equal("rheobase", tornado.GetAttribute("data-readout"));
        Assert.Equal("4", tornado.GetAttribute("data-bars"));
        // The table ranks the four entries by how far they move the rheobase, as the library's report does.
        var rows = cut.FindAll("[data-testid=kd-table] tbody tr");
        Assert.Equal(4, rows.Count);
        Assert.All(rows, r => Assert.Equal("rheobase", r.GetAttribute("data-readout")));
        Assert.Empty(cut.FindAll("[data-testid=kd-progress]"));
        Assert.NotEmpty(cut.FindAll("[data-testid=kd-csv]"));
    }

    [Fact]
    public async Task A_model_built_from_expression_offers_its_genes()
    {
        var demo = Path.Combine(CatalogLocator.FindSourceDirectory()!, "demo");
        Workspace.Session = ExpressionSession.Read(Catalog, File.ReadAllBytes(Path.Combine(demo, "counts.csv")), "counts.csv",
            File.ReadAllBytes(Path.Combine(demo, "metadata.csv")), "metadata.csv", new ReadChoices(null, null, "group"));
        using var map = new MapSession(Workspace, Runner, () => Task.CompletedTask);
        await map.BuildAllAsync();
        var group = Workspace.GroupModels.Keys.First();
        var cut = Render(s => s.OpenSource("group:" + group));
        Assert.Equal("Which genes set the rheobase?", cut.Find("[data-testid=kd-rheobase]").TextContent);
        Assert.NotEmpty(cut.FindAll("[data-testid=kd-genes]"));
        Assert.NotEmpty(cut.FindAll("[data-testid=kd-entries]"));
    }

    [Fact]
    public void Sensitivity_shows_the_heat_map_with_the_per_unit_and_quantised_columns_named()
    {
        var cut = Render(s => s.OpenInitial("wb1996"));
        cut.Find("[data-testid=whatif-tab-sensitivity]").Click();
        cut.Find("[data-testid=sens-run]").Click();
        cut.WaitForAssertion(() => Assert.NotEmpty(cut.FindAll("[data-testid=sensitivity-heatmap]")), Long);
        Assert.Equal("3", cut.Find("[data-testid=sensitivity-heatmap]").GetAttribute("data-channels"));
        // The library's column kinds: potentials per unit ln density, rheobase on a grid (ReadoutScales).
        Assert.Contains("resting_potential in mV per unit ln(density)", cut.Find("[data-testid=sens-per-unit]").TextContent);
        Assert.Contains("rheobase: onset grid of 0.5 %", cut.Find("[data-testid=sens-quantised]").TextContent);
        Assert.NotEmpty(cut.FindAll("[data-testid=sens-csv]"));
    }

    [Fact]
    public void A_running_sensitivity_shows_progress_and_cancel_stops_it()
    {
        var cut = Render(s => s.OpenInitial("cortex-rs2008"));
        cut.Find("[data-testid=whatif-tab-sensitivity]").Click();
        cut.Find("[data-testid=sens-run]").Click();
        cut.WaitForAssertion(() => Assert.NotEmpty(cut.FindAll("[data-testid=sens-cancel]")), Long);
        Assert.True(cut.Find("[data-testid=sens-run]").HasAttribute("disabled"));
        cut.Find("[data-testid=sens-cancel]").Click();
        cut.WaitForAssertion(() => Assert.NotEmpty(cut.FindAll("[data-testid=sens-cancelled]")), Long);
        Assert.Empty(cut.FindAll("[data-testid=sensitivity-heatmap]"));
        Assert.False(cut.Find("[data-testid=sens-run]").HasAttribute("disabled"));
    }

    [Fact]
    public void Recorded_targets_prefill_the_fit_and_say_so()
    {
        var recorded = new[] { FitTarget.WithDefaultScale("resting_potential", -65), new FitTarget("rheobase", 0.4, 0.05) };
        var cut = Render(s => s.OpenInitial("wb1996"), recorded);
        cut.Find("[data-testid=whatif-tab-fit]").Click();
        Assert.Contains("pre-filled from recordings", cut.Find("[data-testid=fit-prefilled]").TextContent);
        var values = cut.FindAll("[data-testid=fit-value]");
        Assert.Equal(["-65", "0.4"], values.Select(v => v.GetAttribute("value")));
        Assert.Equal(["mV", "uA/cm2"], cut.FindAll("[data-testid=fit-unit]").Select(v => v.GetAttribute("value")));
        Assert.Equal("0.05", cut.FindAll("[data-testid=fit-scale]")[1].GetAttribute("value"));
    }

    [Fact]
    public void A_fit_without_targets_says_what_to_give()
    {
        var cut = Render(s => s.OpenInitial("wb1996"));
        cut.Find("[data-testid=whatif-tab-fit]").Click();
        Assert.Empty(cut.FindAll("[data-testid=fit-prefilled]"));
        cut.Find("[data-testid=fit-run]").Click();
        Assert.Contains("Give at least one recorded read-out", cut.Find("[data-testid=error]").TextContent);
        Assert.Empty(cut.FindAll("[data-testid=fit-progress]"));
    }
}
