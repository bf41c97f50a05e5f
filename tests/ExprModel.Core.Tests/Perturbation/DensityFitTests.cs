using ExprModel.Core.Analysis;
using ExprModel.Core.Models;
using ExprModel.Core.Perturbation;
using ExprModel.Core.Simulation;

namespace ExprModel.Core.Tests.Perturbation;

/// <summary>Fits checked against models whose true densities are known (recovery), and the fitted model file's record.</summary>
public class DensityFitTests
{
    private static readonly string[] Readouts =
        ["rheobase", "resting_potential", "input_resistance", "adaptation_ratio", "spike_half_width", "fi_gain", "after_hyperpolarisation", "spike_peak"];

    private static FitTarget[] TargetsOf(ExprModel.Core.Cell.CellModel truth, IEnumerable<string> names)
    {
        var measured = ReadoutValues.From(Features.Measure(new CompiledCell(truth), SensitivitySettings.TightReadouts));
        return names.Select(n => FitTarget.WithDefaultScale(n, measured[n] ?? throw new InvalidOperationException(n + " undefined"))).ToArray();
    }

    [Fact]
    public void Recovery_densities_perturbed_by_known_factors_come_back()
    {
        // The regular-spiking preset with sodium at 0.7 and the M-current at 1.3 of its density is the "recording"; the
        // fit starts from the published densities with no prior. Every density the eight read-outs pin down must come
        // back within 5 % (our tolerance: the read-outs resolve rheobase to 0.5 % and spike times to the 25 us step).
        var doc = TestCatalog.Catalog.Preset("cortex-rs2008");
        var model = doc.ToCellModel(TestCatalog.Catalog.Resolve);
        double[] truth = [0.7, 1, 1.3, 1];
        var targets = TargetsOf(new DensityProbe(model, SensitivitySettings.TightReadouts).Scaled(truth), Readouts);
        var fit = DensityFit.Run(doc, model, targets, new FitSettings { PriorWidth = null, Starts = 1 });
        for (int k = 0; k < truth.Length; k++)
        {
            var c = fit.Channels[k];
            Assert.True(c.Pinned, $"{c.Channel} not pinned (data sd {c.DataSdLn:G3})");
            Assert.InRange(c.FittedRelative / truth[k], 0.95, 1.05);
        }
        Assert.True(fit.MisfitAfter < 0.2 * fit.MisfitBefore, fit.Summary);
        Assert.Contains("traub-na x0.7", fit.Summary);
    }

    [Fact]
    public void A_published_preset_fitted_to_its_own_readouts_from_a_displaced_start_returns_to_one()
    {
        // Wang & Buzsaki 1996: the published densities are the answer; the start is 25 % off on sodium and potassium.
        var published = TestCatalog.Catalog.Preset("wb1996");
        var targets = TargetsOf(published.ToCellModel(TestCatalog.Catalog.Resolve),
            ["rheobase", "resting_potential", "input_resistance", "spike_half_width", "spike_peak", "fi_gain"]);
        var displaced = published.WithRelativeDensities(new Dictionary<string, double> { ["wb-na-1996"] = 1.25, ["wb-k-1996"] = 0.8 });
        var fit = DensityFit.Run(displaced, displaced.ToCellModel(TestCatalog.Catalog.Resolve), targets,
            new FitSettings { PriorWidth = null, Starts = 2, Seed = 7 });
        foreach (var c in fit.Channels.Where(c => c.Pinned)) Assert.InRange(c.FittedRelative, 0.95, 1.05);
        Assert.Contains(fit.Channels, c => c.Channel == "wb-na-1996" && c.Pinned);
        Assert.Equal(2, fit.Starts.Count);
    }

    [Fact]
    public void Too_few_targets_leave_densities_free_and_say_so_and_the_prior_holds_them()
    {
        var doc = TestCatalog.Catalog.Preset("cortex-rs2008");
        var model = doc.ToCellModel(TestCatalog.Catalog.Resolve);
        var targets = new[] { FitTarget.WithDefaultScale("rheobase", 1.2 * TargetsOf(model, ["rheobase"])[0].Value) };
        var fit = DensityFit.Run(doc, model, targets, new FitSettings { Starts = 1, FixedChannels = new HashSet<string> { "leak" } });
        // One read-out cannot pin three densities: at most one direction is seen by the data.
        Assert.True(fit.Channels.Count(c => !c.Fixed && !c.Pinned) >= 2);
        Assert.True(fit.Identifiability.DirectionPinned.Count(p => p) <= 1);
        Assert.True(fit.Channels.Single(c => c.Channel == "leak").Fixed);
        Assert.Equal(1.0, fit.Channels.Single(c => c.Channel == "leak").FittedRelative);
        // The prior (width ln 2) keeps every fold change modest.
        Assert.All(fit.Channels, c => Assert.InRange(c.FittedRelative, 0.5, 2));

        var saved = ModelDocument.Parse(fit.Document.ToJson(), "fitted.json");
        var record = saved.Derivation!["fit"]!;
        Assert.Equal(Math.Log(2), record["priorWidthLn"]!.GetValue<double>(), 12);
        Assert.Equal(1, record["seed"]!.GetValue<int>());
        Assert.Equal("rheobase", record["targets"]![0]!["readout"]!.GetValue<string>());
        Assert.Contains("(fitted)", saved.Name);
        Assert.Equal(ResearchCaution.Text, saved.Caution);
    }

    [Fact]
    public void Bad_targets_and_settings_are_refused_by_name()
    {
        var doc = TestCatalog.Catalog.Preset("wb1996");
        var model = doc.ToCellModel(TestCatalog.Catalog.Resolve);
        var t = FitTarget.WithDefaultScale("rheobase", 1);
        Assert.Contains("priorWidth", Assert.Throws<ArgumentException>(() => DensityFit.Run(doc, model, [t], new FitSettings { PriorWidth = -1 })).Message);
        Assert.Contains("twice", Assert.Throws<ArgumentException>(() => DensityFit.Run(doc, model, [t, t])).Message);
        Assert.Contains("'kv7'", Assert.Throws<ArgumentException>(() => DensityFit.Run(doc, model, [t],
            new FitSettings { FixedChannels = new HashSet<string> { "kv7" } })).Message);
    }
}
