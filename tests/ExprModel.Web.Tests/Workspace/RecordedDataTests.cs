using System.Globalization;
using ExprModel.Core.Mapping;
using ExprModel.Data.Catalog;
using ExprModel.Web.Hosting;
using ExprModel.Web.Simulation;
using ExprModel.Web.Workspace;
using MathNet.Numerics.Statistics;
using Microsoft.Extensions.Options;

namespace ExprModel.Web.Tests.Workspace;

/// <summary>
/// Recorded values of a model's target on the shipped demo survey: checked against the values written in
/// catalog/demo/metadata.csv, read here by plain splitting, with MathNet.Numerics' mean and SD as the reference.
/// </summary>
public sealed class RecordedDataTests : IDisposable
{
    private static readonly string Demo = Path.Combine(CatalogLocator.FindSourceDirectory()!, "demo");
    private readonly string _dir = Path.Combine(Path.GetTempPath(), "exprmodel-recorded-" + Guid.NewGuid().ToString("N"));
    private readonly WorkspaceState _workspace = new();
    private readonly ModelRunner _runner;

    public RecordedDataTests()
    {
        Directory.CreateDirectory(_dir);
        var catalog = CatalogLocator.Ensure(Path.Combine(_dir, "catalog.db"));
        _runner = new ModelRunner(catalog, new SimulationGate(Options.Create(new WebOptions())));
        _workspace.Session = ExpressionSession.Read(catalog, File.ReadAllBytes(Path.Combine(Demo, "counts.csv")), "counts.csv",
            File.ReadAllBytes(Path.Combine(Demo, "metadata.csv")), "metadata.csv", new ReadChoices(null, null, "group"));
    }

    /// <summary>(group, rheobase pA) of every metadata row with a recorded rheobase.</summary>
    private static List<(string Cell, string Group, double RheobasePa)> MetadataRheobases()
    {
        var lines = File.ReadAllLines(Path.Combine(Demo, "metadata.csv"));
        int col = Array.IndexOf(lines[0].Split(','), "rheobase (pA)");
        return lines.Skip(1).Select(l => l.Split(',')).Where(f => f[col].Length > 0)
            .Select(f => (f[0], f[1], double.Parse(f[col], CultureInfo.InvariantCulture))).ToList();
    }

    private async Task<RecordedData> LoadDemo()
    {
        var intake = new RecordingsIntake(_workspace, () => Task.CompletedTask);
        await intake.UseMetadataAsync(new UploadedFile("metadata.csv", File.ReadAllBytes(Path.Combine(Demo, "metadata.csv"))));
        await intake.AddDemoSweepsAsync(Path.Combine(Demo, "recordings"));
        Assert.True(intake.MatchTo(_workspace.Session!.Dataset), intake.Error);
        return _workspace.Recorded;
    }

    [Fact]
    public async Task The_comparison_takes_a_cells_sweeps_over_the_table_as_the_command_line_does()
    {
        var recorded = await LoadDemo();
        var compared = recorded.Compared!;
        var resistance = compared.Readouts.Single(r => r.Readout == "input_resistance");
        // FH1001 has both a table value and sweeps: the value compared is the one measured from its sweeps.
        var fromSweeps = recorded.SweepReadouts["FH1001"].Readouts.InputResistanceMOhm!.Value;
        Assert.Equal(fromSweeps, resistance.ValueByCell["FH1001"]);
        Assert.NotEqual(MetadataValue("FH1001", "input resistance (MOhm)"), fromSweeps);
        // A cell with a table value and no sweeps keeps its table value.
        var tableOnly = MetadataRheobases().First(r => !recorded.SweepReadouts.ContainsKey(r.Cell));
        var rheobase = compared.Readouts.Single(r => r.Readout == "rheobase_absolute");
        Assert.Equal(tableOnly.RheobasePa, rheobase.ValueByCell[tableOnly.Cell]);
    }

    [Fact]
    public async Task A_cells_fit_targets_are_what_it_was_compared_with_measured_on_the_recorded_steps()
    {
        var recorded = await LoadDemo();
        var targets = recorded.FitTargetsFor(ModelTarget.ForCell("FH1001"), 5000)!;
        var resistance = targets.Targets.Single(t => t.Readout == "input_resistance");
        Assert.Equal(recorded.SweepReadouts["FH1001"].Readouts.InputResistanceMOhm!.Value, resistance.Value);
        // The demo's recorded steps last 400 ms (catalog/demo/README.md); the fit measures the model on the same steps.
        Assert.Equal(400, targets.StepDurationMs);
        Assert.Same(targets, recorded.FitTargetsFor(ModelTarget.ForCell("FH1001"), 5000));
        Assert.Null(recorded.FitTargetsFor(ModelTarget.ForCell("FH9999"), 5000));
    }

    private static double MetadataValue(string cell, string header)
    {
        var lines = File.ReadAllLines(Path.Combine(Demo, "metadata.csv"));
        int col = Array.IndexOf(lines[0].Split(','), header);
        return double.Parse(lines.Skip(1).Select(l => l.Split(',')).Single(f => f[0] == cell)[col], CultureInfo.InvariantCulture);
    }

    [Fact]
    public async Task A_cells_values_come_from_its_sweeps_and_the_table_fills_what_they_lack()
    {
        var recorded = await LoadDemo();
        var fh1001 = recorded.ValuesFor(ModelTarget.ForCell("FH1001"));
        // FH1001 has sweeps and a table row: the sweeps win, as in the comparison and `exprmodel compare`.
        Assert.Equal(recorded.SweepReadouts["FH1001"].Readouts.RheobasePa, fh1001["rheobase_absolute"].Value);
        Assert.Equal("sweeps", fh1001["rheobase_absolute"].Source);
        Assert.Equal("pA", fh1001["rheobase_absolute"].Unit);
        Assert.Equal((1, (double?)null), (fh1001["rheobase_absolute"].Cells, fh1001["rheobase_absolute"].Sd));
        // A cell with a table row and no sweeps takes the table's value.
        var tableOnly = MetadataRheobases().First(r => !recorded.SweepReadouts.ContainsKey(r.Cell));
        Assert.Equal(tableOnly.RheobasePa, recorded.ValuesFor(ModelTarget.ForCell(tableOnly.Cell))["rheobase_absolute"].Value);
        Assert.Empty(recorded.ValuesFor(ModelTarget.ForCell("FH1005")));
    }

    [Fact]
    public async Task A_groups_values_are_mean_sd_and_n_over_its_recorded_cells()
    {
        var recorded = await LoadDemo();
        // Each T2 cell's rheobase as for a cell: its sweeps' when they give one (the demo's FH2001-FH2003 have NWB files),
        // else the table's.
        var table = MetadataRheobases().Where(r => r.Group == "T2-adapting").ToDictionary(r => r.Cell, r => r.RheobasePa);
        var cells = table.Keys.Concat(recorded.SweepReadouts.Keys.Where(k => k.StartsWith("FH2", StringComparison.Ordinal))).Distinct();
        var group = cells
            .Select(c => (recorded.SweepReadouts.TryGetValue(c, out var s) ? s.Readouts.RheobasePa : null)
                ?? (table.TryGetValue(c, out var t) ? t : null))
            .OfType<double>().ToArray();
        Assert.True(group.Length > 2, "the demo has T2 cells with a recorded rheobase");
        var v = recorded.ValuesFor(ModelTarget.ForGroup("T2-adapting"))["rheobase_absolute"];
        Assert.Equal(group.Length, v.Cells);
        Assert.Equal(group.Mean(), v.Value, 1e-9);
        Assert.Equal(group.StandardDeviation(), v.Sd!.Value, 1e-9);
    }

    [Fact]
    public async Task A_column_can_be_matched_by_hand_and_a_unit_that_does_not_fit_is_refused()
    {
        var recorded = await LoadDemo();
        recorded.Choose("rheobase (pA)", "none");
        Assert.DoesNotContain(recorded.Features!.Readouts, r => r.Header == "rheobase (pA)");
        var error = Assert.Throws<UserInputException>(() => recorded.Choose("input resistance (MOhm)", "resting_potential"));
        Assert.Contains("input resistance (MOhm)", error.Message);
        // The refused choice leaves the earlier match in place.
        Assert.Equal("input_resistance", recorded.Features!.Matches.Single(m => m.Header == "input resistance (MOhm)").Readout);
        recorded.Choose("rheobase (pA)", "");
        Assert.Contains(recorded.Features!.Readouts, r => r.Readout == "rheobase_absolute");
    }

    [Fact]
    public async Task The_overlay_runs_the_model_with_the_sweeps_step_through_the_models_area()
    {
        var recorded = await LoadDemo();
        var cell = recorded.Cells["FH1001"];
        var sweep = RecordedTraceOverlay.DefaultSweep(cell, recorded.SweepReadouts["FH1001"])!;
        var model = _runner.Catalog.Preset("wb1996");
        using var overlay = new RecordedTraceOverlay(_runner, () => Task.CompletedTask);
        await overlay.ShowAsync(model, sweep);
        Assert.Null(overlay.Error);
        // 1 uA/cm2 on 1000 um2 is 10 pA (docs: DOMAIN units; identity A[um2] x 1e-8 cm2/um2 x 1e6 pA/uA).
        double areaUm2 = model.Cell.ToGeometry().AreaUm2;
        Assert.Equal(sweep.Step!.AmplitudePa, overlay.AmplitudeUaPerCm2!.Value * areaUm2 / 100, 1e-9);
        var p = overlay.Simulated!.Protocol;
        Assert.Equal((sweep.Step.OnsetMs, sweep.Step.DurationMs), (p.DelayMs, p.StepMs));
        Assert.Equal(sweep.DurationMs, p.TotalMs, 1e-9);
    }

    public void Dispose()
    {
        try { Directory.Delete(_dir, recursive: true); } catch (IOException) { }
    }
}
