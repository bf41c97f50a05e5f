using ExprModel.Core.Analysis;
using ExprModel.Core.Cell;
using ExprModel.Core.Kinetics;
using ExprModel.Core.Simulation;

namespace ExprModel.Core.Tests.Simulation;

/// <summary>The SIMD sweep must give the scalar loop's spikes (same scheme; only rounding may differ).</summary>
public class SweepKernelTests
{
    [SimdTheory]
    [InlineData("hh1952", 19.375)]
    [InlineData("wb1996", 2.0)]
    [InlineData("cortex-rs2008", 4.0)]
    public void SimdSweepMatchesScalarLoop(string preset, double to)
    {
        var cell = TestCatalog.Preset(preset);
        var amps = Enumerable.Range(0, 7).Select(i => to * i / 6).ToArray();
        var scalar = SimdAgreement.Check(cell, amps, 1000, preset);
        Assert.True(scalar.Sum(p => p.SpikesInStep) > 20);
    }

    [SimdTheory]
    [InlineData(ReversalRule.Nernst)]
    [InlineData(ReversalRule.GoldmanHodgkinKatz)]
    public void SimdSweepMatchesScalarLoopWithCalciumShellAndCalciumGatedPotassium(ReversalRule rule)
    {
        var cat = TestCatalog.Catalog;
        var src = new Citation { Authors = "test", Year = 2026, Journal = "none" };
        var calcium = new ChannelEntry
        {
            Id = "test-cav",
            Version = 1,
            Name = "test calcium",
            Family = "Cav-HVA",
            Ion = Ion.Calcium,
            Reversal = rule,
            Gates = [new GateSpec { Name = "m", Power = 2, Kind = GateKind.SteadyStateAndTau, SteadyState = GateRate.Boltzmann(-20, 6),
                TimeConstantMs = GateRate.Constant(1) }],
            ReferenceTemperatureC = 6.3,
            Q10 = 3,
            TypicalDensityMsPerCm2 = 1,
            MinDensityMsPerCm2 = 0,
            MaxDensityMsPerCm2 = 10,
            Source = src,
        };
        var sk = new ChannelEntry
        {
            Id = "test-sk",
            Version = 1,
            Name = "test SK",
            Family = "SK",
            Ion = Ion.Potassium,
            Reversal = ReversalRule.Fixed,
            ReversalMv = -77,
            Gates = [new GateSpec { Name = "q", Power = 1, Kind = GateKind.Calcium, Calcium = new CalciumSensitivity(5e-4, 4, 5) }],
            ReferenceTemperatureC = 6.3,
            Q10 = 1,
            TypicalDensityMsPerCm2 = 1,
            MinDensityMsPerCm2 = 0,
            MaxDensityMsPerCm2 = 10,
            Source = src,
        };
        var preset = cat.BuildCell(cat.Preset("hh1952"));
        var model = preset with
        {
            CalciumShell = new CalciumShell { DepthUm = 0.1, DecayMs = 50, RestMm = 5e-5, BufferCapacity = 0 },
            Channels =
                [.. preset.Channels, new ChannelInstance { Entry = calcium, DensityMsPerCm2 = 0.1 }, new ChannelInstance { Entry = sk, DensityMsPerCm2 = 0.5 }],
        };
        var cell = new CompiledCell(model);
        var amps = new[] { 0.0, 5, 10, 15, 20, 30 };
        var scalar = SimdAgreement.Check(cell, amps, 500, rule.ToString());
        Assert.True(scalar.Sum(p => p.SpikesInStep) > 20, string.Join(",", scalar.Select(p => p.SpikesInStep)));
        // Calcium-activated potassium current slows firing compared with the cell without it.
        var plain = FiCurve.Measure(new CompiledCell(preset), amps, 500);
        Assert.True(plain[^1].SpikesInStep > scalar[^1].SpikesInStep, $"with SK {scalar[^1].SpikesInStep}, without {plain[^1].SpikesInStep}");
    }
}
