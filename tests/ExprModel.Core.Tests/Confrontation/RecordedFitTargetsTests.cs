using ExprModel.Core.Confrontation;
using ExprModel.Core.Perturbation;
using ExprModel.Core.Recordings;
using ExprModel.Core.Tests.Expression;
using ExprModel.Core.Tests.Recordings;

namespace ExprModel.Core.Tests.Confrontation;

public sealed class RecordedFitTargetsTests : IDisposable
{
    private readonly TempFiles _files = new();
    public void Dispose() => _files.Dispose();

    private const string Table = "cell,group,resting potential (mV),input resistance (MOhm),rheobase (nA),sag ratio (fraction),excitability class (1 or 2)\n"
        + "a1,A,-70,100,0.10,0.004,1\na2,A,-66,200,0.12,0.006,1\na3,A,-68,300,0.08,,2\nb1,B,-60,150,0.05,,\n";

    private RecordedFeatures Features() => ReadoutMatcher.Match(RecordedFeatureReader.Read(_files.Text("rec.csv", Table)), _ => true);

    [Fact]
    public void A_cells_values_become_targets_in_the_readouts_units_with_default_scales()
    {
        var t = RecordedFitTargets.ForCell(Features(), "a1", areaUm2: 5000);
        var byName = t.Targets.ToDictionary(x => x.Readout);
        Assert.Equal(-70, byName["resting_potential"].Value);
        Assert.Equal(1, byName["resting_potential"].Scale); // 1 mV for potentials (ReadoutScales.DefaultFitScale)
        Assert.Equal(100, byName["input_resistance"].Value);
        Assert.Equal(5, byName["input_resistance"].Scale, 12); // 5 % of the target
        Assert.Equal(100, byName["rheobase_absolute"].Value, 9); // 0.10 nA = 100 pA
        // A sag ratio near zero is noise: its scale is floored, not 5 % of 0.004.
        Assert.Equal(RecordedFitTargets.MinimumSagScale, byName["sag_ratio"].Scale);
        // The class is discrete: recorded, not fitted.
        Assert.DoesNotContain("excitability_class", byName.Keys);
        Assert.Contains(t.Notes, n => n.StartsWith("excitability_class") && n.Contains("discrete"));
    }

    [Fact]
    public void The_rheobase_of_a_step_family_targets_the_middle_of_its_step_spacing()
    {
        // The analytic family spikes first at 40 pA, 20 pA above the silent step: the true rheobase is uniform in (20, 40].
        var measured = RecordingFeatures.Measure(SyntheticSweeps.Family(0.02));
        var features = RecordedSweepFeatures.From([measured], "synthetic", _ => true);
        var t = RecordedFitTargets.For(features, [measured], "synthetic", null, null, 5000);
        var rheobase = t.Targets.Single(x => x.Readout == "rheobase_absolute");
        Assert.Equal(30, rheobase.Value, 9);
        Assert.Equal(20 / Math.Sqrt(12), rheobase.Scale, 9); // SD of a uniform distribution over the spacing (identity)
        Assert.Equal(SyntheticSweeps.StepMs, t.StepDurationMs);
    }

    [Fact]
    public void A_groups_mean_is_scaled_by_its_recorded_sd_or_by_the_default_below_three_cells()
    {
        var t = RecordedFitTargets.ForGroup(Features(), "A", ["a1", "a2", "a3"], 5000);
        var rin = t.Targets.Single(x => x.Readout == "input_resistance");
        Assert.Equal(200, rin.Value, 12);
        Assert.Equal(100, rin.Scale, 12); // sample SD of 100, 200, 300
        // Two sag values: too few for a spread, so the (floored) default scale.
        var sag = t.Targets.Single(x => x.Readout == "sag_ratio");
        Assert.Equal(0.005, sag.Value, 12);
        Assert.Equal(RecordedFitTargets.MinimumSagScale, sag.Scale);
        Assert.Contains(t.Notes, n => n.StartsWith("sag_ratio: mean of 2 cell(s)"));
    }

    [Fact]
    public void Bad_requests_name_what_is_wrong()
    {
        Assert.Contains("no recorded values for cell 'zz'", Assert.Throws<ArgumentException>(() => RecordedFitTargets.ForCell(Features(), "zz", 5000)).Message);
        Assert.Contains("'rheobas' is not a read-out", Assert.Throws<ArgumentException>(() => RecordedFitTargets.ForCell(Features(), "a1", 5000,
            readouts: ["rheobas"])).Message);
        Assert.Contains("one of the two", Assert.Throws<ArgumentException>(() => RecordedFitTargets.For(Features(), [], "a1", "A", ["a1"], 5000)).Message);
    }
    /// <summary>
    /// Recovery on a demo recording: FH1001 was simulated from its expression-built model with hidden per-channel factors
    /// (catalog/demo/recordings/hidden-factors.json, written by the seeded generator). Fitting that model to the read-outs
    /// measured from the recording must bring every channel the fit reports as pinned down to within ln 1.5 of its hidden
    /// factor: ln 1.5 is the fit's own criterion for "pinned" (the data fix the channel to that many ln units per scale of
    /// misfit, FitSettings.PinnedWithinLn). Free channels are not checked: the data do not fix them.
    /// </summary>
    [Fact]
    public void Fitting_a_demo_cell_to_its_recording_recovers_the_hidden_factors_of_its_pinned_channels()
    {
        var dir = Path.Combine(ExprModel.Data.Catalog.CatalogLocator.FindSourceDirectory()!, "demo");
        var data = ExprModel.Core.Mapping.ExpressionDataset.Read(TestCatalog.Catalog.ForMapping(), Path.Combine(dir, "counts.csv"),
            new ExprModel.Core.Expression.ExpressionReadOptions(),
            Path.Combine(dir, "metadata.csv"), "group");
        var doc = data.Build(data.Map(), new ExprModel.Core.Mapping.DensityRule(), ExprModel.Core.Mapping.ModelTarget.ForCell("FH1001")).Document;
        var model = TestCatalog.Catalog.BuildCell(doc);
        var measured = RecordingReader.Read(Path.Combine(dir, "recordings", "FH1001.nwb")).Select(c => RecordingFeatures.Measure(c)).ToArray();
        var targets = RecordedFitTargets.For(RecordedSweepFeatures.From(measured, "FH1001.nwb", _ => true), measured, "FH1001", null, null,
            model.Geometry.AreaUm2);
        var settings = FitSettings.Default with { Starts = 1, Readouts = FitSettings.Default.Readouts with { StepDurationMs = targets.StepDurationMs!.Value } };
        var fit = DensityFit.Run(doc, model, targets.Targets, settings);

        var hidden = System.Text.Json.Nodes.JsonNode.Parse(File.ReadAllText(Path.Combine(dir, "recordings", "hidden-factors.json")))!["cells"]!.AsArray()
            .Single(c => (string)c!["cell"]! == "FH1001")!["density_factors"]!.AsObject();
        var pinned = fit.Channels.Where(c => c.Pinned).ToArray();
        Assert.NotEmpty(pinned);
        foreach (var c in pinned)
            Assert.True(Math.Abs(Math.Log(c.FoldChange / (double)hidden[c.Channel]!)) <= settings.PinnedWithinLn,
                $"{c.Channel}: fitted x{c.FoldChange:G3}, hidden x{(double)hidden[c.Channel]!:G3}");
    }
}
