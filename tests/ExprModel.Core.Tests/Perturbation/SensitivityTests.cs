using ExprModel.Core.Perturbation;

namespace ExprModel.Core.Tests.Perturbation;

/// <summary>Signs of the sensitivity matrix against physiology (common practice, no single source).</summary>
public class SensitivityTests
{
    private static readonly Lazy<SensitivityMatrix> Rs = new(() => Sensitivity.Run(TestCatalog.Preset("cortex-rs2008").Model));

    [Fact]
    public void More_transient_sodium_lowers_rheobase()
    {
        // Common practice: more available sodium conductance brings threshold current down.
        Assert.True(Rs.Value.At("traub-na", "rheobase") < -0.05, $"elasticity {Rs.Value.At("traub-na", "rheobase")}");
    }

    [Fact]
    public void More_m_type_potassium_raises_adaptation()
    {
        // Common practice: the M-current builds up over a train and lengthens later intervals (DOMAIN.md, adaptation).
        Assert.True(Rs.Value.At("kv7-m-yamada", "adaptation_ratio") > 0.05, $"elasticity {Rs.Value.At("kv7-m-yamada", "adaptation_ratio")}");
    }

    [Fact]
    public void More_leak_lowers_input_resistance()
    {
        // Common practice; for a passive sphere R_in = 1 / (g_L A) (textbook identity), so the elasticity lies between -1 and 0
        // and near -1 when leak dominates the resting conductance.
        var e = Rs.Value.At("leak", "input_resistance");
        Assert.True(e is < -0.3 and >= -1.05, $"elasticity {e}");
    }

    [Fact]
    public void Potentials_are_per_unit_ln_density_and_say_so()
    {
        var col = Rs.Value.Columns.Single(c => c.Readout == "resting_potential");
        Assert.Equal(ElasticityKind.PerLogDensity, col.Kind);
        Assert.Contains("mV per unit ln(density)", col.EntryUnit);
        // More leak (reversal -70 mV) pulls rest towards -70 mV from wherever the other channels hold it: never away.
        var csv = Rs.Value.ToCsv(["caution"]);
        Assert.Contains("resting_potential: mV per unit ln(density) (its sign can cross zero", csv);
        Assert.Contains("rheobase: onset grid of 0.5 % (relative)", csv);
    }

    [Fact]
    public void A_difference_with_one_side_undefined_is_one_sided()
    {
        // Identity: with y = exp(2 ln g), d ln y / d ln g = 2 exactly whichever differences are used.
        double h = 0.2, g = 1.3;
        double Y(double lnG) => Math.Exp(2 * lnG);
        var central = Sensitivity.Difference(Y(Math.Log(g) - h), Y(Math.Log(g)), Y(Math.Log(g) + h), h, ElasticityKind.LogRatio);
        var oneSided = Sensitivity.Difference(null, Y(Math.Log(g)), Y(Math.Log(g) + h), h, ElasticityKind.LogRatio);
        Assert.Equal(2, central.Value!.Value, 9);
        Assert.False(central.OneSided);
        Assert.Equal(2, oneSided.Value!.Value, 9);
        Assert.True(oneSided.OneSided);
        Assert.Null(Sensitivity.Difference(null, null, 1, h, ElasticityKind.LogRatio).Value);
    }
}
