using ExprModel.Core.Kinetics;

namespace ExprModel.Core.Tests.Kinetics;

public class NernstTests
{
    [Fact]
    public void Potassium_reversal_at_37_C_with_5_and_140_mM_is_minus_89_1_mV()
    {
        // CODATA 2018 constants; worked check in DOMAIN.md: E_K = -89.1 mV (37 C, 5 mM out, 140 mM in), stated to 0.1 mV.
        Assert.Equal(-89.1, Nernst.PotentialMv(5, 140, 1, 37), 0.05);
    }

    [Fact]
    public void Constants_are_the_exact_2019_si_values()
    {
        // CODATA 2018: R = 8.314462618 J/(mol K), F = 96485.33212 C/mol (DOMAIN.md).
        Assert.Equal(8.314462618, PhysicalConstants.GasConstant);
        Assert.Equal(96485.33212, PhysicalConstants.Faraday);
    }

    [Fact]
    public void Divalent_ion_has_half_the_thermal_voltage_and_equal_concentrations_give_zero()
    {
        // Textbook identity of the Nernst equation E = (RT/zF) ln(c_out/c_in).
        Assert.Equal(Nernst.PotentialMv(2, 1e-4, 1, 37) / 2, Nernst.PotentialMv(2, 1e-4, 2, 37), 9);
        Assert.Equal(0, Nernst.PotentialMv(3, 3, 1, 20), 12);
        Assert.Throws<ArgumentOutOfRangeException>(() => Nernst.PotentialMv(0, 140, 1, 37));
    }

    [Fact]
    public void Ghk_calcium_driving_term_vanishes_at_the_calcium_nernst_potential_and_is_ohmic_far_below_it()
    {
        // A single-ion GHK current reverses exactly at that ion's Nernst potential (Hodgkin & Katz 1949);
        // far below reversal, exp(-zFV/RT) dominates and G(V) -> V (the scaling documented on GhkDrivingMv).
        double cin = 1e-4, cout = 2, t = 36;
        double eCa = Nernst.PotentialMv(cout, cin, 2, t);
        Assert.Equal(0, Nernst.GhkDrivingMv(eCa, cin, cout, 2, t), 9);
        // At -100 mV exp(-zFV/RT) is about 1800, so G differs from V by 1/1800 of V (0.06 mV).
        Assert.Equal(-100, Nernst.GhkDrivingMv(-100, cin, cout, 2, t), 0.1);
        Assert.True(Nernst.GhkDrivingMv(0, cin, cout, 2, t) < 0, "inward calcium current at 0 mV");
        // The removable singularity at 0 mV is continuous.
        Assert.Equal(Nernst.GhkDrivingMv(1e-7, cin, cout, 2, t), Nernst.GhkDrivingMv(0, cin, cout, 2, t), 6);
    }
}
