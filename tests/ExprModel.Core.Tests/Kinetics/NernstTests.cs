using ExprModel.Core.Kinetics;

namespace ExprModel.Core.Tests.Kinetics;

public class NernstTests
{
    [Fact]
    public void PotassiumAt37CelsiusMatchesTheCodataWorkedValue()
    {
        // CODATA 2018 R and F; worked check in DOMAIN.md: E_K = -89.1 mV at 37 C, 5 mM out, 140 mM in.
        double e = Nernst.PotentialMv(5, 140, 1, 37);
        Assert.InRange(e, -89.15, -89.05);
        Assert.Equal(8.314462618, PhysicalConstants.GasConstant);
        Assert.Equal(96485.33212, PhysicalConstants.Faraday);
    }

    [Fact]
    public void GhkDrivingTermIsSmoothThroughZeroAndReversesAtNernst()
    {
        double ci = 1e-4, co = 2;
        double near = Nernst.GhkDrivingMv(1e-9, ci, co, 2, 36);
        double left = Nernst.GhkDrivingMv(-1e-3, ci, co, 2, 36);
        double right = Nernst.GhkDrivingMv(1e-3, ci, co, 2, 36);
        Assert.InRange(near, Math.Min(left, right), Math.Max(left, right));
        // Flux reverses at the Nernst potential (GHK current equation, Goldman 1943; Hodgkin & Katz 1949).
        double eCa = Nernst.PotentialMv(co, ci, 2, 36);
        Assert.True(Nernst.GhkDrivingMv(eCa - 1, ci, co, 2, 36) < 0);
        Assert.True(Nernst.GhkDrivingMv(eCa + 1, ci, co, 2, 36) > 0);
        // Far below reversal the slope is 1 (documented scaling).
        double slope = Nernst.GhkDrivingMv(-99, ci, co, 2, 36) - Nernst.GhkDrivingMv(-100, ci, co, 2, 36);
        Assert.InRange(slope, 0.99, 1.01);
    }
}
