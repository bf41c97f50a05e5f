using ExprModel.Core.Analysis;
using ExprModel.Core.Cell;
using ExprModel.Core.Simulation;

namespace ExprModel.Core.Tests.Analysis;

/// <summary>A passive sphere: tau = C / g_L and R_in = 1 / (g_L A) (textbook identity).</summary>
public class PassiveSphereTests
{
    [Fact]
    public void TimeConstantAndInputResistanceMatchTheIdentity()
    {
        var leak = TestCatalog.Catalog.Resolve("leak", 1);
        double gL = 0.05, areaUm2 = 20000;
        var cell = new CompiledCell(new CellModel
        {
            Geometry = new Geometry { AreaUm2 = areaUm2, CapacitanceUfPerCm2 = 1.0 },
            Channels = [new ChannelInstance { Entry = leak, DensityMsPerCm2 = gL, ReversalMv = -70 }],
            InitialVoltageMv = -70,
        });
        var r = Features.Measure(cell);
        double tauMs = 1.0 / gL; // C [uF/cm2] / g [mS/cm2] = ms
        double rinMOhm = 1.0 / (gL * 1e-3 * areaUm2 * 1e-8) / 1e6;
        Assert.Equal(tauMs, r.MembraneTimeConstantMs!.Value, 0.01 * tauMs);
        Assert.Equal(rinMOhm, r.InputResistanceMOhm!.Value, 0.005 * rinMOhm);
        Assert.Equal(-70, r.RestingPotentialMv!.Value, 1e-6);
        Assert.Null(r.RheobaseUaPerCm2);
    }

    [Fact]
    public void GeometryConversionsAreConsistent()
    {
        // 1 uA/cm2 on 1000 um2 is 10 pA (DOMAIN.md units).
        var g = new Geometry { AreaUm2 = 1000 };
        Assert.Equal(10, g.DensityToPicoamps(1), 12);
        Assert.Equal(1, g.PicoampsToDensity(10), 12);
        var d = Geometry.FromDiameter(10);
        Assert.Equal(Math.PI * 100, d.AreaUm2, 9);
        var c = Geometry.FromCapacitance(10); // 10 pF at 1 uF/cm2 = 1000 um2
        Assert.Equal(1000, c.AreaUm2, 9);
    }

    [Fact]
    public void ACellWithoutSodiumHasNoRheobase()
    {
        // Without a regenerative inward current there is no action potential (Hodgkin & Huxley 1952), however far a
        // large step pushes V past the detection level.
        var doc = TestCatalog.Catalog.Preset("wb1996").WithRelativeDensities(new Dictionary<string, double> { ["wb-na-1996"] = 0 });
        var r = Features.Measure(new CompiledCell(TestCatalog.Catalog.BuildCell(doc)), ReadoutSettings.Live);
        Assert.Null(r.RheobaseUaPerCm2);
        Assert.Null(r.ThresholdMv);
        Assert.NotNull(r.InputResistanceMOhm);
    }
}
