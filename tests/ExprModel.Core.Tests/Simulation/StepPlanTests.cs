using System.Runtime.Intrinsics;
using ExprModel.Core.Cell;
using ExprModel.Core.Kinetics;
using ExprModel.Core.Simulation;

namespace ExprModel.Core.Tests.Simulation;

/// <summary>
/// The step plan's shared formulas against their definitions: the Hill steady state against
/// CalciumSensitivity.SteadyStateAt (Math.Pow), the conductance product against density x product of x^p (Math.Pow),
/// and the four-lane forms against the one-lane forms.
/// </summary>
public sealed class StepPlanTests
{
    private static readonly double[] HillCoefficients = [1, 2, 3, 4, 5, -1, -2, 2.5, -0.7];

    private static CompiledCell Cell()
    {
        var src = new Citation { Authors = "test", Year = 2026, Journal = "none" };
        var gates = HillCoefficients.Select((n, i) =>
            new GateSpec { Name = $"q{i}", Power = 1 + i % 3, Kind = GateKind.Calcium, Calcium = new CalciumSensitivity(3e-4 * (1 + i), n, 5) }).ToArray();
        var hill = new ChannelEntry
        {
            Id = "test-hill",
            Version = 1,
            Name = "test Hill gates",
            Family = "SK",
            Ion = Ion.Potassium,
            Reversal = ReversalRule.Fixed,
            ReversalMv = -80,
            Gates = gates,
            ReferenceTemperatureC = 22,
            Q10 = 1,
            TypicalDensityMsPerCm2 = 1,
            MinDensityMsPerCm2 = 0,
            MaxDensityMsPerCm2 = 10,
            Source = src,
        };
        var preset = TestCatalog.Catalog.BuildCell(TestCatalog.Catalog.Preset("hh1952"));
        return new CompiledCell(preset with
        {
            CalciumShell = new CalciumShell(),
            Channels = [.. preset.Channels, new ChannelInstance { Entry = hill, DensityMsPerCm2 = 0.7 }],
        });
    }

    private static readonly double[] CalciumMm = [0, 1e-6, 5e-5, 2e-4, 1e-3, 0.01, 0.3];

    [Fact]
    public void Hill_steady_state_is_the_calcium_sensitivitys_to_rounding()
    {
        var cell = Cell();
        int first = cell.GateCount - HillCoefficients.Length;
        for (int i = 0; i < HillCoefficients.Length; i++)
        {
            var spec = cell.Kinetics.Plan.Update[first + i];
            Assert.Equal(GateUpdate.CalciumHill, spec);
            var sensitivity = cell.Model.Channels[^1].Entry.Gates[i].Calcium!;
            foreach (var ca in CalciumMm)
            {
                double want = sensitivity.SteadyStateAt(ca), got = cell.Plan.HillSteadyState<ScalarLanes, double>(first + i, ca);
                // Whole powers by multiplication differ from Math.Pow by a few ulp at most.
                Assert.True(Math.Abs(got - want) <= 1e-14 * want + 1e-200, $"n = {HillCoefficients[i]}, ca = {ca}: {got} vs {want}");
            }
        }
    }

    [Fact]
    public void Conductance_is_density_times_each_gate_to_its_power()
    {
        var cell = Cell();
        var rng = new Random(5);
        var x = Enumerable.Range(0, cell.GateCount).Select(_ => rng.NextDouble()).ToArray();
        for (int c = 0; c < cell.ChannelCount; c++)
        {
            double want = cell.Model.Channels[c].EffectiveDensityMsPerCm2;
            int g = cell.Kinetics.GateStart[c];
            foreach (var gate in cell.Model.Channels[c].Entry.Gates) want *= Math.Pow(x[g++], gate.Power);
            Assert.Equal(want, cell.Plan.Conductance<ScalarLanes, double>(c, cell.Gbar[c], x), 1e-14 * want);
        }
    }

    [SimdFact]
    public void Four_lane_forms_agree_with_the_one_lane_forms()
    {
        var cell = Cell();
        var plan = cell.Plan;
        var ca = Vector256.Create(CalciumMm[0], CalciumMm[2], CalciumMm[4], CalciumMm[6]);
        for (int g = cell.GateCount - HillCoefficients.Length; g < cell.GateCount; g++)
        {
            var lanes = plan.HillSteadyState<VectorLanes, Vector256<double>>(g, ca);
            for (int l = 0; l < 4; l++)
            {
                double one = plan.HillSteadyState<ScalarLanes, double>(g, ca[l]);
                // Fractional coefficients use the inlined exp and log (within 2 ulp each, InlineExpTests); at zero calcium the
                // four-lane power is exp(-700) (the floor of InlineExp), not 0, hence the absolute floor.
                Assert.True(Math.Abs(lanes[l] - one) <= 1e-13 * one + 1e-200, $"gate {g}, lane {l}: {lanes[l]} vs {one}");
            }
        }
        var rng = new Random(6);
        var x = Enumerable.Range(0, cell.GateCount).Select(_ => Vector256.Create(rng.NextDouble(), rng.NextDouble(), rng.NextDouble(), rng.NextDouble()))
            .ToArray();
        for (int c = 0; c < cell.ChannelCount; c++)
        {
            var lanes = plan.Conductance<VectorLanes, Vector256<double>>(c, Vector256.Create(cell.Gbar[c]), x);
            for (int l = 0; l < 4; l++)
                Assert.Equal(plan.Conductance<ScalarLanes, double>(c, cell.Gbar[c], x.Select(v => v[l]).ToArray()), lanes[l]);
        }
    }
}
