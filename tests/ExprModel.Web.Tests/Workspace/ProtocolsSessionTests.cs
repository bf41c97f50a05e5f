using ExprModel.Core.Analysis;
using ExprModel.Data.Catalog;
using ExprModel.Data.Store;
using ExprModel.Web.Hosting;
using ExprModel.Web.Simulation;
using ExprModel.Web.Workspace;
using Microsoft.Extensions.Options;

namespace ExprModel.Web.Tests.Workspace;

/// <summary>The Workbench's protocols area driven without a renderer, with the real catalog and simulator.</summary>
public sealed class ProtocolsSessionTests : IDisposable
{
    private readonly string _dir = Path.Combine(Path.GetTempPath(), "exprmodel-protocols-" + Guid.NewGuid().ToString("N"));
    private readonly ChannelCatalog _catalog;
    private readonly ModelRunner _runner;
    private readonly SimulationGate _gate = new(Options.Create(new WebOptions()));
    private readonly SnapshotStore _store;
    private readonly List<IDisposable> _owned = [];

    public ProtocolsSessionTests()
    {
        Directory.CreateDirectory(_dir);
        _catalog = CatalogLocator.Ensure(Path.Combine(_dir, "catalog.db"));
        _runner = new ModelRunner(_catalog, _gate);
        _store = SnapshotStore.Open(Path.Combine(_dir, "snapshots.db"));
    }

    private (WorkbenchSession Workbench, ProtocolsSession Protocols) Open(WorkspaceState workspace, string? preset = "hh1952")
    {
        var workbench = new WorkbenchSession(_runner, workspace, _catalog, () => Task.CompletedTask);
        workbench.OpenInitial(preset);
        var protocols = new ProtocolsSession(_runner, _gate, workbench, workspace, () => Task.CompletedTask);
        _owned.Add(workbench);
        _owned.Add(protocols);
        return (workbench, protocols);
    }

    [Fact]
    public async Task The_brief_pulse_reports_spike_or_none_and_the_library_s_pulse_threshold()
    {
        var (workbench, protocols) = Open(new WorkspaceState());
        protocols.Show(ProtocolForms.Pulse);
        protocols.SetText("amplitude", "1");
        protocols.SetText("width", "1");
        protocols.Start();
        await protocols.Job.Running;
        Assert.Null(protocols.Job.Error);
        var result = protocols.Result!;
        Assert.StartsWith("No spike.", result.Summary);
        var cell = _runner.Compile(workbench.Current());
        var (rest, _) = PulseThreshold.SettledRest(cell);
        var found = PulseThreshold.Find(cell, rest, 1)!;
        Assert.Contains($"Pulse threshold {found.ThresholdUaPerCm2:0.###} µA/cm²", result.Summary);
        Assert.Equal(3, result.Plots[0].Series.Count);
        Assert.StartsWith("# " + ExprModel.Core.Models.ResearchCaution.Text[..20], protocols.Csv()!.Text);
        Assert.Contains("# pulse threshold: ", protocols.Csv()!.Text);
    }

    [Theory]
    [InlineData("train", "spike")]
    [InlineData("ramp", "spike")]
    [InlineData("noise", "spike")]
    public async Task Current_protocols_give_a_trace_plot_and_the_command_line_s_trace_csv(string kind, string expected)
    {
        var (_, protocols) = Open(new WorkspaceState());
        protocols.Show(kind);
        protocols.SetText(kind == "ramp" ? "to" : kind == "noise" ? "mean" : "amplitude", "30");
        protocols.Start();
        await protocols.Job.Running;
        Assert.Null(protocols.Job.Error);
        Assert.Contains(expected, protocols.Result!.Summary);
        Assert.Equal(["protocol-voltage", "protocol-current"], protocols.Result.Plots.Select(p => p.Key));
        var csv = protocols.Csv()!;
        Assert.Equal($"{kind}-trace.csv", csv.Name);
        Assert.Contains("time_ms,voltage_mv,stimulus_ua_per_cm2", csv.Text);
    }

    [Fact]
    public async Task An_uploaded_waveform_runs_and_a_bad_one_is_refused_naming_line_and_column()
    {
        var (_, protocols) = Open(new WorkspaceState());
        protocols.Show(ProtocolForms.Waveform);
        protocols.Start();
        Assert.Contains("upload a file", protocols.InputError);
        protocols.WaveformUnit = "density";
        protocols.Upload("bad.csv", "time_ms,current\n0,0\n10,x\n");
        Assert.Equal("bad.csv: line 3, column 2: 'x' is not a current.", protocols.InputError);
        Assert.Null(protocols.Waveform);
        protocols.Upload("good.csv", "time_ms,current\n0,0\n100,0\n101,40\n300,40\n301,0\n");
        Assert.Null(protocols.InputError);
        protocols.Start();
        await protocols.Job.Running;
        Assert.Null(protocols.Job.Error);
        Assert.Contains("spike", protocols.Result!.Summary);
    }

    [Fact]
    public async Task The_clamp_family_gives_three_plots_and_the_command_line_s_columns_with_inactivation()
    {
        var (_, protocols) = Open(new WorkspaceState());
        protocols.Show(ProtocolForms.Clamp);
        protocols.SetText("from", "-80");
        protocols.SetText("to", "20");
        protocols.SetText("increment", "20");
        protocols.SetText("conditioning", "100");
        protocols.Start();
        await protocols.Job.Running;
        Assert.Null(protocols.Job.Error);
        Assert.Equal(["clamp-iv", "clamp-activation", "clamp-inactivation"], protocols.Result!.Plots.Select(p => p.Key));
        Assert.All(protocols.Result.Plots, p => Assert.Equal(3, p.Series.Count)); // hh1952: Na, K, leak
        Assert.Contains("inactivation_", protocols.Csv()!.Text);
        Assert.Equal(6, protocols.Csv()!.Text.Split('\n', StringSplitOptions.RemoveEmptyEntries).Count(l => l.StartsWith('-') || char.IsDigit(l[0])));
    }

    [Theory]
    [InlineData("width", "abc", "Brief pulse, width: 'abc' is not a number.")]
    [InlineData("width", "0", "Brief pulse, width: 0 ms is outside 0.01 to 100.")]
    public void A_bad_setting_is_refused_naming_it(string key, string text, string message)
    {
        var (_, protocols) = Open(new WorkspaceState());
        protocols.SetText(key, text);
        protocols.Start();
        Assert.Equal(message, protocols.InputError);
        Assert.False(protocols.Job.Busy);
    }

    [Fact]
    public async Task A_share_link_stores_the_protocol_and_opening_it_restores_the_form()
    {
        var workspace = new WorkspaceState();
        var (workbench, protocols) = Open(workspace);
        await workbench.LiveRun;
        protocols.Show(ProtocolForms.Noise);
        protocols.SetText("sd", "4.5");
        protocols.SetText("seed", "42");
        protocols.Start();
        await protocols.Job.Running;
        await workbench.ShareAsync(new SnapshotService(_store, _runner), "noise", storeExpression: false);
        Assert.Null(workbench.Error);
        var opened = await new SnapshotService(_store, _runner).OpenAsync(workbench.SharedSnapshotId!, CancellationToken.None);
        Assert.Equal(ProtocolForms.Noise, opened!.Protocol.Injected!.Kind);
        Assert.Equal(42, opened.Protocol.Injected.Values["seed"]);

        // What the shared page's "Open in the Workbench" does, in a new tab.
        var other = new WorkspaceState();
        other.Open(opened.Model, "shared model", opened.Stored.Id);
        other.Injected = opened.Protocol.Injected;
        var (_, restored) = Open(other, null);
        Assert.Equal(ProtocolForms.Noise, restored.Kind);
        Assert.Equal("4.5", restored.Text("sd"));
        restored.Start();
        await restored.Job.Running;
        Assert.Equal(protocols.Csv()!.Text, restored.Csv()!.Text);
    }

    [Fact]
    public void A_link_shared_before_protocols_were_stored_still_opens()
    {
        var old = System.Text.Json.JsonSerializer.Deserialize<SnapshotProtocol>(
            """{"step":{"amplitudeUaPerCm2":10,"delayMs":100,"stepMs":500,"afterMs":100},"fi":{"fromUaPerCm2":0,"toUaPerCm2":30,"steps":16}}""",
            SnapshotService.Json);
        Assert.NotNull(old);
        Assert.Null(old!.Injected);
        Assert.Equal(500, old.Step.StepMs);
    }

    public void Dispose()
    {
        foreach (var d in _owned) d.Dispose();
        try { Directory.Delete(_dir, true); } catch (IOException) { }
    }
}
