using ExprModel.Core.Models;
using ExprModel.Core.Perturbation;
using ExprModel.Data.Catalog;
using ExprModel.Web.Hosting;
using ExprModel.Web.Simulation;
using ExprModel.Web.Workspace;
using Microsoft.Extensions.Options;

namespace ExprModel.Web.Tests.Workspace;

/// <summary>The Workbench's "why and what-if" jobs driven without a renderer, with the real catalog, simulator and library.</summary>
public sealed class WhatIfSessionTests : IDisposable
{
    private readonly string _dir = Path.Combine(Path.GetTempPath(), "exprmodel-whatif-" + Guid.NewGuid().ToString("N"));
    private readonly ChannelCatalog _catalog;
    private readonly SimulationGate _gate;
    private readonly ModelRunner _runner;
    private readonly WorkspaceState _workspace = new();

    public WhatIfSessionTests()
    {
        Directory.CreateDirectory(_dir);
        _catalog = CatalogLocator.Ensure(Path.Combine(_dir, "catalog.db"));
        _gate = new SimulationGate(Options.Create(new WebOptions()));
        _runner = new ModelRunner(_catalog, _gate);
    }

    private async Task<(WorkbenchSession Bench, WhatIfSession WhatIf)> Open(string preset)
    {
        var bench = new WorkbenchSession(_runner, _workspace, _catalog, () => Task.CompletedTask);
        bench.OpenInitial(preset);
        await bench.LiveRun;
        return (bench, new WhatIfSession(_runner, _gate, bench, () => Task.CompletedTask));
    }

    [Fact]
    public async Task Removing_sodium_from_wb1996_loses_the_rheobase_first_as_the_library_measures_it()
    {
        var (bench, whatIf) = await Open("wb1996");
        using var benchScope = bench;
        using var whatIfScope = whatIf;
        var k = whatIf.Knockdown;
        Assert.False(k.HasGenes(bench.Current()));
        k.SetLevel(0);
        k.WhichSetRheobase();
        await k.Job.Running;
        Assert.Null(k.Job.Error);
        Assert.False(k.Job.Busy);
        Assert.Equal(KnockdownKind.Channel, k.Kind);
        Assert.Equal(3, k.Job.Total);
        Assert.Equal(3, k.Job.Done);

        // Without sodium the cell cannot fire (Wang & Buzsaki 1996: spikes are carried by the transient sodium current):
        // its rheobase is lost, and lost read-outs rank before every finite change.
        var ranked = k.Rows();
        var sodium = ranked.Single(c => c.Target == "wb-na-1996");
        Assert.True(sodium.Lost);
        Assert.All(ranked.TakeWhile(c => c != sodium), c => Assert.True(c.Lost || c.Gained));
        Assert.Contains(k.Tornado()!.Bars, b => b.Target == "wb-na-1996" && b.Lost);

        // The same numbers as the library's own knock-down of the same model.
        var cell = _runner.Compile(bench.Current()).Model;
        var library = Knockdown.Run(cell, KnockdownTarget.Channels(new DensityProbe(cell, Knockdown.DefaultSettings).ChannelLabels, 0), 0);
        Assert.Equal(library.AllRanked().Select(c => (c.Target, c.Readout, c.Intact, c.KnockedDown)),
            k.Report!.AllRanked().Select(c => (c.Target, c.Readout, c.Intact, c.KnockedDown)));
        Assert.Contains(ResearchCaution.Text, k.Csv()!.Text);
        Assert.False(whatIf.IsStale(k.MeasuredModelJson));
        bench.SetRelative(0, 0.5);
        Assert.True(whatIf.IsStale(k.MeasuredModelJson));
    }

    [Fact]
    public async Task Wb1996_fitted_from_displaced_sliders_to_its_published_readouts_returns_to_one()
    {
        var (bench, whatIf) = await Open("wb1996");
        using var benchScope = bench;
        using var whatIfScope = whatIf;
        // The published read-outs, measured with the fit's own settings, are the recording; the sliders start 25 % off.
        var published = new DensityProbe(_runner.Compile(bench.Current()).Model, FitSettings.Default.Readouts).MeasureIntact();
        whatIf.Prefill(new[] { "rheobase", "resting_potential", "input_resistance", "spike_half_width", "spike_peak", "fi_gain" }
            .Select(r => FitTarget.WithDefaultScale(r, published[r]!.Value)));
        Assert.True(whatIf.Fit.Prefilled);
        var labels = bench.Model!.Channels.Select(c => c.Entry).ToList();
        bench.SetRelative(labels.IndexOf("wb-na-1996"), 1.25);
        bench.SetRelative(labels.IndexOf("wb-k-1996"), 0.8);
        whatIf.Fit.NoPrior = true;
        whatIf.Fit.Starts = 1;
        whatIf.StartFit();
        await whatIf.Fit.Job.Running;
        Assert.Null(whatIf.Fit.Job.Error);
        var fit = whatIf.Fit.Result!;
        // The tolerance of the library's own recovery check (DensityFitTests): pinned densities within 5 % of the published ones.
        foreach (var c in fit.Channels.Where(c => c.Pinned)) Assert.InRange(c.FittedRelative, 0.95, 1.05);
        Assert.Contains(fit.Channels, c => c.Channel == "wb-na-1996" && c.Pinned);
        Assert.True(fit.MisfitAfter < fit.MisfitBefore);

        whatIf.Fit.OpenFitted();
        Assert.StartsWith("fitted to 6 recorded read-out(s) from published model wb1996", bench.Origin);
        Assert.Equal(fit.Document.Name, bench.Model.Name);
        Assert.Contains(ResearchCaution.Text, whatIf.Fit.FittedModelFile()!.Text);
        await bench.LiveRun;
    }

    [Fact]
    public async Task A_typed_target_the_library_refuses_is_reported_with_its_row_and_nothing_runs()
    {
        var (bench, whatIf) = await Open("wb1996");
        using var benchScope = bench;
        using var whatIfScope = whatIf;
        FitRun.Choose(whatIf.Fit.Rows[0], "rheobase");
        whatIf.Fit.Rows[0].Value = "4";
        whatIf.Fit.Rows[0].Unit = "mV";
        whatIf.StartFit();
        Assert.Equal("target row 1: target 'rheobase=4mV': rheobase is in uA/cm2, not 'mV'.", whatIf.Fit.InputError);
        Assert.False(whatIf.Fit.Job.Busy);
    }

    [Fact]
    public async Task Cancel_stops_a_sensitivity_run_and_keeps_no_result()
    {
        var (bench, whatIf) = await Open("cortex-rs2008");
        using var benchScope = bench;
        using var whatIfScope = whatIf;
        var s = whatIf.Sensitivity;
        var firstVariant = new TaskCompletionSource();
        using var watch = new Timer(_ => { if (s.Job.Done > 0) firstVariant.TrySetResult(); }, null, 0, 5);
        s.Start();
        Assert.True(s.Job.Busy);
        await firstVariant.Task.WaitAsync(TimeSpan.FromMinutes(2));
        s.Job.Cancel();
        await s.Job.Running;
        Assert.True(s.Job.Cancelled);
        Assert.False(s.Job.Busy);
        Assert.Null(s.Matrix);
        Assert.True(s.Job.Done < s.Job.Total, $"the run went on to the end ({s.Job.Done} of {s.Job.Total})");
    }

    [Fact]
    public async Task A_background_job_gives_its_gate_slot_to_a_waiting_request_between_evaluations()
    {
        var oneSlot = new SimulationGate(Options.Create(new WebOptions { MaxConcurrentSimulations = 1 }));
        bool externalRan = false, externalRanBeforeCheckpoint;
        Task? external = null;
        bool completedWhileJobRan = await GatedWorker.RunAsync(oneSlot, checkpoint =>
        {
            external = oneSlot.RunAsync(_ => externalRan = true, CancellationToken.None);
            // The job holds the only slot: the other request must wait (given time to run if the bound were broken).
            Thread.Sleep(100);
            externalRanBeforeCheckpoint = externalRan;
            Assert.False(externalRanBeforeCheckpoint);
            for (int i = 0; i < 1000 && !external.IsCompleted; i++) checkpoint();
            return external.IsCompleted;
        }, CancellationToken.None);
        Assert.True(completedWhileJobRan);
        Assert.True(externalRan);
    }

    public void Dispose()
    {
        try { Directory.Delete(_dir, true); } catch (IOException) { }
    }
}
