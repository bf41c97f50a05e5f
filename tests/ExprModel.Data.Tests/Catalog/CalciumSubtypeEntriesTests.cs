using ExprModel.Core.Cell;
using ExprModel.Core.Expression.Identifiers;
using ExprModel.Core.Kinetics;
using ExprModel.Core.Mapping;
using ExprModel.Core.Simulation;
using MathNet.Numerics;

namespace ExprModel.Data.Tests.Catalog;

/// <summary>
/// The subtype-resolved high-voltage-activated calcium entries of the CA1 model lineage (Jaffe et al. 1994, J Neurophysiol
/// 71:1065, equations recalled) against their recalled rate equations written out here in the paper's own form, so a sign
/// slip in the entry's parametric shapes shows up. Roots are found with MathNet's bracketing root finder, independent of
/// the catalog's bisection.
/// </summary>
public class CalciumSubtypeEntriesTests
{
    private const string LType = "cav1-l-jaffe1994";
    private const string NType = "cav22-n-ca1-1994";

    private static ChannelEntry Entry(string id) => CatalogFiles.Content.Entries.Where(e => e.Id == id).MaxBy(e => e.Version)!; // the latest version

    // Recalled equations (V in mV, rates per ms), as the curator notes give them.
    private static double LTypeAlphaM(double v) => 15.69 * (81.5 - v) / (Math.Exp((81.5 - v) / 10) - 1);
    private static double LTypeBetaM(double v) => 0.29 * Math.Exp(-v / 10.86);
    private static double NTypeAlphaM(double v) => 0.1967 * (19.88 - v) / (Math.Exp((19.88 - v) / 10) - 1);
    private static double NTypeBetaM(double v) => 0.046 * Math.Exp(-v / 20.73);
    private static double NTypeAlphaH(double v) => 1.6e-4 * Math.Exp(-v / 48.4);
    private static double NTypeBetaH(double v) => 1 / (Math.Exp((39 - v) / 10) + 1);

    /// <summary>Where alpha = beta (x_inf = 0.5), solved on log(alpha/beta) so the root is well scaled.</summary>
    private static double HalfPoint(Func<double, double> alpha, Func<double, double> beta) =>
        FindRoots.OfFunction(v => Math.Log(alpha(v) / beta(v)), -100, 60, 1e-10);

    /// <summary>The gate as the simulator compiles it: steady state of gate <paramref name="gate"/> in a cell holding only this entry.</summary>
    private static double CompiledSteadyState(ChannelEntry entry, int gate, double vMv)
    {
        var cell = new CompiledCell(new CellModel
        {
            Geometry = Geometry.FromDiameter(20),
            TemperatureC = 36,
            CalciumShell = new CalciumShell(),
            Channels = [new ChannelInstance { Entry = entry, DensityMsPerCm2 = entry.TypicalDensityMsPerCm2 }],
        });
        return cell.GateSteadyState(gate, vMv, GateRate.RestingCalciumMm);
    }

    [Theory]
    [InlineData(-90)]
    [InlineData(-40)]
    [InlineData(-21)]
    [InlineData(0)]
    [InlineData(19.88)]
    [InlineData(39)]
    [InlineData(81.5)]
    [InlineData(100)]
    public void Entry_rates_equal_the_recalled_equations_as_written(double vMv)
    {
        var l = Entry(LType).Gates.Single(g => g.Name == "m");
        var n = Entry(NType);
        var (nm, nh) = (n.Gates.Single(g => g.Name == "m"), n.Gates.Single(g => g.Name == "h"));
        // At the removable singularities (V = 81.5 and 19.88 mV) the written form is 0/0; compare there with its limit a*k.
        double lAlpha = vMv == 81.5 ? 15.69 * 10 : LTypeAlphaM(vMv);
        double nAlpha = vMv == 19.88 ? 0.1967 * 10 : NTypeAlphaM(vMv);
        const double relative = 1e-9;
        Assert.Equal(lAlpha, l.Alpha!.Evaluate(vMv), lAlpha * relative);
        Assert.Equal(LTypeBetaM(vMv), l.Beta!.Evaluate(vMv), LTypeBetaM(vMv) * relative);
        Assert.Equal(nAlpha, nm.Alpha!.Evaluate(vMv), nAlpha * relative);
        Assert.Equal(NTypeBetaM(vMv), nm.Beta!.Evaluate(vMv), NTypeBetaM(vMv) * relative);
        Assert.Equal(NTypeAlphaH(vMv), nh.Alpha!.Evaluate(vMv), NTypeAlphaH(vMv) * relative);
        Assert.Equal(NTypeBetaH(vMv), nh.Beta!.Evaluate(vMv), NTypeBetaH(vMv) * relative);
    }

    [Fact]
    public void L_type_activation_half_point_from_the_recalled_rates_is_high_voltage_activated()
    {
        double half = HalfPoint(LTypeAlphaM, LTypeBetaM);
        // DOMAIN.md: high-voltage-activated Cav half-activation about -45 to +5 mV (common practice, from memory).
        Assert.InRange(half, -45, 5);
        // The recalled equations put it at -1.34 mV (a rough hand estimate in the issue said about -3 mV).
        Assert.Equal(-1.34, half, 0.01);
        Assert.Equal(0.5, CompiledSteadyState(Entry(LType), 0, half), 1e-9);
    }

    [Fact]
    public void N_type_activation_and_inactivation_half_points_from_the_recalled_rates()
    {
        var entry = Entry(NType);
        double mHalf = HalfPoint(NTypeAlphaM, NTypeBetaM);
        double hHalf = HalfPoint(NTypeAlphaH, NTypeBetaH);
        Assert.InRange(mHalf, -45, 5); // DOMAIN.md HVA band (common practice, from memory)
        Assert.Equal(-21.63, mHalf, 0.01);
        Assert.Equal(-40.11, hHalf, 0.01);
        Assert.Equal(0.5, CompiledSteadyState(entry, 0, mHalf), 1e-9);
        Assert.Equal(0.5, CompiledSteadyState(entry, 1, hHalf), 1e-9);
        // h closes with depolarisation, slowly: tau_h = 1/(alpha_h + beta_h) is 1.36 s at its half point (reference temperature).
        var h = entry.Gates[1];
        Assert.True(h.SteadyStateAt(-80) > 0.9 && h.SteadyStateAt(0) < 0.1);
        Assert.Equal(1 / (NTypeAlphaH(hHalf) + NTypeBetaH(hHalf)), h.TimeConstantAt(hHalf), 1e-6);
        Assert.InRange(h.TimeConstantAt(hHalf), 1300, 1400);
    }

    [Theory]
    [InlineData(0.0, 1.0)]
    [InlineData(0.001, 0.5)]      // at Ki the factor is one half
    [InlineData(0.003, 0.25)]
    [InlineData(0.0001, 1 / 1.1)]
    public void Version_2_carries_the_calcium_dependent_inactivation_factor(double calciumMm, double expected)
    {
        // Ki/(Ki + [Ca]i) with Ki = 0.001 mM (recalled), written as an instantaneous calcium gate with Hill coefficient -1.
        // Version 3 adds only the citation check (issue 17); version 2 and later carry the factor.
        foreach (var entry in CatalogFiles.Content.Entries.Where(e => e.Id is LType or NType && e.Version >= 2))
        {
            var f = entry.Gates.Single(g => g.DependsOnCalcium);
            Assert.True(f.Instantaneous);
            Assert.Equal(expected, f.SteadyStateAt(0, calciumMm), 12);
            Assert.Equal(expected, f.SteadyStateAt(-60, calciumMm), 12); // voltage-independent
            Assert.Equal(ReversalRule.GoldmanHodgkinKatz, entry.Reversal);
            Assert.Equal(Verification.Recalled, entry.Source.Verification);
            // Jaffe et al. 1994: DOI as PubMed 8201402 gives it; version 2 had none.
            Assert.Equal(entry.Version == 2 ? "" : "10.1152/jn.1994.71.3.1065", entry.Source.Doi);
        }
        Assert.Equal(3, Entry(LType).Version);
    }

    [Fact]
    public void Version_1_stays_as_it_was_without_the_factor()
    {
        foreach (var id in new[] { LType, NType })
        {
            var v1 = CatalogFiles.Content.Entries.Single(e => e.Id == id && e.Version == 1);
            Assert.DoesNotContain(v1.Gates, g => g.DependsOnCalcium);
            Assert.Contains("NOT REPRESENTED: the calcium-dependent inactivation factor Ki/(Ki + [Ca]i)", v1.CuratorNote, StringComparison.Ordinal);
        }
    }

    [Theory]
    [InlineData("CACNA1C", LType)]
    [InlineData("CACNA1D", LType)]
    [InlineData("CACNA1F", LType)]
    [InlineData("CACNA1B", NType)]
    [InlineData("CACNA1E", "cav-hva-reuveni1993")] // R-type kinetics not recalled well enough: pooled HVA entry
    [InlineData("CACNA1A", "cav21-p-deschutter1994")]
    public void Hva_calcium_genes_feed_their_subtype_entry_in_every_species(string human, string entryId)
    {
        foreach (var species in new[] { Species.Human, Species.Mouse, Species.Rat })
        {
            string symbol = species == Species.Human ? human : human[0] + human[1..].ToLowerInvariant();
            var links = CatalogFiles.Content.GeneLinks.Where(l => l.Species == species && l.Symbol == symbol).ToArray();
            Assert.Equal(entryId, Assert.Single(links).EntryId);
        }
    }
}
