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

    [Fact]
    public void Divalent_ion_has_half_the_thermal_voltage_and_equal_concentrations_give_zero()
    {
        // Textbook identities of the Nernst equation E = (RT/zF) ln(c_out/c_in).
        Assert.Equal(Nernst.PotentialMv(2, 1e-4, 1, 37) / 2, Nernst.PotentialMv(2, 1e-4, 2, 37), 9);
        Assert.Equal(0, Nernst.PotentialMv(3, 3, 1, 20), 12);
        Assert.Throws<ArgumentOutOfRangeException>(() => Nernst.PotentialMv(0, 140, 1, 37));
    }

    [Fact]
    public void Ghk_calcium_driving_term_is_exactly_zero_at_the_calcium_nernst_potential_and_inward_at_zero()
    {
        // A single-ion GHK current reverses exactly at that ion's Nernst potential (Hodgkin & Katz 1949).
        double cin = 1e-4, cout = 2, t = 36;
        Assert.Equal(0, Nernst.GhkDrivingMv(Nernst.PotentialMv(cout, cin, 2, t), cin, cout, 2, t), 9);
        Assert.True(Nernst.GhkDrivingMv(0, cin, cout, 2, t) < 0, "inward calcium current at 0 mV");
        // At -100 mV exp(-zFV/RT) is about 1800, so G differs from V by about 1/1800 of V (0.06 mV).
        Assert.Equal(-100, Nernst.GhkDrivingMv(-100, cin, cout, 2, t), 0.1);
    }
}
