using ExprModel.Core.Kinetics;

namespace ExprModel.Data.Tests.Catalog;

/// <summary>
/// Each entry's curves against outside references: the family bands of DOMAIN.md (common practice, from memory;
/// plausibility bands, not targets) and the values its own source paper states (recorded in the entry's "published" list).
/// The curves are evaluated here with this file's own bisection, independent of CatalogReport.
/// </summary>
public class KineticsChecksTests
{
    /// <summary>Band edges are inclusive to this tolerance (mV): several papers put a half-activation exactly on a round edge.</summary>
    private const double BandEdgeToleranceMv = 0.01;

    private static ChannelEntry Entry(string key) => CatalogFiles.Content.Entries.Single(x => x.Key == key);

    /// <summary>
    /// Where the gate's steady state crosses 0.5 on [-150, 100] mV. A Boltzmann steady state that the source wrote as a root
    /// (exponent 1/p, e.g. w_inf = B^(1/4) in Rothman &amp; Manis 2003) is taken before the root: that is the half-activation
    /// the source states and the one a G-V fit of the channel reports.
    /// </summary>
    internal static double? Half(GateSpec g)
    {
        Func<double, double> f = g.SteadyState is { Shape: RateShape.Boltzmann } b && b.Exponent != 1 && g.Kind == GateKind.SteadyStateAndTau
            ? v => 1 / (1 + Math.Exp((b.V0 - v) / b.K)) * (1 - b.Floor) + b.Floor
            : v => g.SteadyStateAt(v);
        double lo = -150, hi = 100, flo = f(lo) - 0.5, fhi = f(hi) - 0.5;
        if (flo * fhi > 0) return null;
        while (hi - lo > 1e-10)
        {
            double mid = (lo + hi) / 2, fm = f(mid) - 0.5;
            if (Math.Sign(fm) == Math.Sign(fhi)) { hi = mid; fhi = fm; } else lo = mid;
        }
        return (lo + hi) / 2;
    }

    private static bool Closes(GateSpec g) => g.SteadyStateAt(-100) > g.SteadyStateAt(40);

    [Theory]
    [MemberData(nameof(CatalogFiles.EntryKeys), MemberType = typeof(CatalogFiles))]
    public void Mammalian_half_activations_lie_in_their_family_band(string key)
    {
        var e = Entry(key);
        if (!ChannelFamilies.Bands.TryGetValue(e.Family, out var band)) return; // unbanded families: checked by their own values
        var voltageGates = e.Gates.Where(g => !g.DependsOnCalcium).ToArray();
        Assert.NotEmpty(voltageGates);
        // A gate that closes with depolarisation is an inactivation gate when the channel also has a gate that opens with it;
        // in a channel opened by hyperpolarisation (HCN) the closing gate is its activation gate.
        bool hasOpening = voltageGates.Any(g => !Closes(g));
        foreach (var g in voltageGates)
        {
            bool inactivation = hasOpening && Closes(g);
            var half = Half(g);
            if (inactivation)
            {
                if (band.InactivationLowMv is not { } lo || band.InactivationHighMv is not { } hi) continue;
                if (half is null) continue; // e.g. a non-inactivating floor of 0.5 (Rothman & Manis 2003 z gate) never crosses 0.5
                Assert.InRange(half.Value, lo - BandEdgeToleranceMv, hi + BandEdgeToleranceMv);
            }
            else
            {
                Assert.True(half is not null, $"{key}.{g.Name}: steady state never crosses 0.5");
                Assert.True(half!.Value >= band.ActivationLowMv - BandEdgeToleranceMv && half.Value <= band.ActivationHighMv + BandEdgeToleranceMv,
                    $"{key}.{g.Name}: half-activation {half:0.00} mV outside the {e.Family} band " +
                    $"{band.ActivationLowMv}..{band.ActivationHighMv} mV (DOMAIN.md)");
            }
        }
    }

    [Theory]
    [MemberData(nameof(CatalogFiles.EntryKeys), MemberType = typeof(CatalogFiles))]
    public void Published_values_are_reproduced_by_the_entry_curves(string key)
    {
        var e = Entry(key);
        foreach (var p in e.PublishedValues)
        {
            var g = e.Gates.SingleOrDefault(x => x.Name == p.Gate);
            Assert.True(g is not null, $"{key}: published value names unknown gate '{p.Gate}'");
            double actual = p.Quantity switch
            {
                "half-activation" => Half(g!) ?? double.NaN,
                "slope" => Slope(g!),
                "tau-at" => g!.TimeConstantAt(p.AtMv),
                "steady-at" => g!.SteadyStateAt(p.AtMv),
                "calcium-half-activation" => CalciumHalf(g!, p.AtMv),
                "sodium-half-activation" => SodiumHalf(g!, p.AtMv),
                _ => throw new Xunit.Sdk.XunitException($"{key}: unknown published quantity '{p.Quantity}'"),
            };
            Assert.True(Math.Abs(actual - p.Value) <= p.Tolerance,
                $"{key}: {p.Quantity} of {p.Gate} is {actual:G6}, the source ({e.Source.Authors} {e.Source.Year}, {p.Where}) " +
                    $"states {p.Value:G6} +/- {p.Tolerance:G3}");
        }
    }

    /// <summary>Boltzmann slope factor k at the half point: for x = 1/(1 + exp((Vh - V)/k)), dx/dV = 1/(4k) at Vh.</summary>
    private static double Slope(GateSpec g)
    {
        double vh = Half(g) ?? double.NaN;
        Func<double, double> f = g.SteadyState is { Shape: RateShape.Boltzmann } b && b.Exponent != 1
            ? v => 1 / (1 + Math.Exp((b.V0 - v) / b.K))
            : v => g.SteadyStateAt(v);
        const double h = 1e-4;
        double d = (f(vh + h) - f(vh - h)) / (2 * h);
        return 1 / (4 * d);
    }

    /// <summary>Shell sodium (mM) at which the gate's steady state is 0.5, by bisection on 0.001-1000 mM in log concentration.</summary>
    private static double SodiumHalf(GateSpec g, double vMv)
    {
        double lo = -3, hi = 3; // log10 mM
        for (int i = 0; i < 200; i++)
        {
            double mid = 0.5 * (lo + hi);
            if (g.SteadyStateAt(vMv, sodiumMm: Math.Pow(10, mid)) < 0.5) lo = mid; else hi = mid;
        }
        return Math.Pow(10, 0.5 * (lo + hi));
    }

    private static double CalciumHalf(GateSpec g, double vMv)
    {
        double lo = -9, hi = 1; // log10 mM
        for (int i = 0; i < 200; i++)
        {
            double mid = (lo + hi) / 2;
            if (g.SteadyStateAt(vMv, Math.Pow(10, mid)) > 0.5) hi = mid; else lo = mid;
        }
        return Math.Pow(10, (lo + hi) / 2);
    }

    [Theory]
    [MemberData(nameof(CatalogFiles.EntryKeys), MemberType = typeof(CatalogFiles))]
    public void M_current_time_constants_are_tens_to_hundreds_of_ms(string key)
    {
        // DOMAIN.md: Kv7/M time constants of tens to hundreds of ms (common practice, from memory), at the entry's own temperature.
        var e = Entry(key);
        if (e.Family != "Kv7") return;
        foreach (var g in e.Gates)
        {
            double max = Enumerable.Range(-100, 141).Max(v => g.TimeConstantAt(v));
            Assert.InRange(max, 10, 1000);
        }
    }

    [Theory]
    [MemberData(nameof(CatalogFiles.EntryKeys), MemberType = typeof(CatalogFiles))]
    public void Calcium_entries_use_calcium_rules_and_calcium_gated_entries_need_calcium(string key)
    {
        var e = Entry(key);
        if (e.Ion == Ion.Calcium) Assert.NotEqual(ReversalRule.Fixed, e.Reversal);
        if (e.Family is "SK" or "BK")
        {
            Assert.Contains(e.Gates, g => g.DependsOnCalcium);
            var g = e.Gates.First(x => x.DependsOnCalcium);
            // Calcium-activated K channels open more as calcium rises (Kohler et al. 1996; Moczydlowski & Latorre 1983).
            Assert.True(g.SteadyStateAt(0, 1e-2) > g.SteadyStateAt(0, 1e-4), $"{key}: open probability must rise with calcium");
        }
    }

    [Fact]
    public void At_least_one_calcium_entry_uses_the_goldman_hodgkin_katz_rule()
    {
        Assert.Contains(CatalogFiles.Content.Entries, e => e.Ion == Ion.Calcium && e.Reversal == ReversalRule.GoldmanHodgkinKatz);
    }

    [Fact]
    public void The_issue_5_families_are_all_present()
    {
        var families = CatalogFiles.Content.Entries.Select(e => e.Family).ToHashSet();
        foreach (var f in new[] { "Nav-transient", "Nav-persistent", "Kv1", "Kv2", "Kv3", "Kv4", "Kv7", "Kir", "K2P", "SK", "BK", "HCN", "Cav3", "Cav-HVA" })
            Assert.Contains(f, families);
        Assert.Contains(CatalogFiles.Content.Entries, e => e.Id.StartsWith("nalcn", StringComparison.Ordinal));
    }

    [Fact]
    public void Bk_gate_depends_on_voltage_and_calcium_as_moczydlowski_and_latorre_1983_describe()
    {
        var bk = CatalogFiles.Content.Entries.Where(e => e.Id == "bk-moczydlowski1983").MaxBy(e => e.Version)!.Gates.Single();
        // Depolarisation and calcium both raise the open probability; calcium shifts activation to more negative voltages.
        Assert.True(bk.SteadyStateAt(40, 1e-3) > bk.SteadyStateAt(-40, 1e-3));
        Assert.True(bk.SteadyStateAt(0, 1e-2) > bk.SteadyStateAt(0, 1e-3));
        double HalfAt(double ca)
        {
            double lo = -200, hi = 200;
            for (int i = 0; i < 100; i++) { double m = (lo + hi) / 2; if (bk.SteadyStateAt(m, ca) > 0.5) hi = m; else lo = m; }
            return (lo + hi) / 2;
        }
        Assert.True(HalfAt(1e-2) < HalfAt(1e-3) - 20, "a tenfold rise in calcium should shift BK half-activation by tens of mV");
        // tau = 1/(alpha + beta) depends on calcium as well.
        Assert.NotEqual(bk.TimeConstantAt(0, 1e-4), bk.TimeConstantAt(0, 1e-2));
    }
}

public class ReversalRuleTests
{
    [Theory]
    [MemberData(nameof(CatalogFiles.EntryKeys), MemberType = typeof(CatalogFiles))]
    public void Entry_reversal_follows_its_rule_in_a_mammalian_cell(string key)
    {
        var e = CatalogFiles.Content.Entries.Single(x => x.Key == key);
        var cell = new Core.Cell.CellModel
        {
            Geometry = Core.Cell.Geometry.FromDiameter(20),
            TemperatureC = 37,
            Channels = [new Core.Cell.ChannelInstance { Entry = e, DensityMsPerCm2 = 1 }],
        };
        double erev = cell.ReversalPotentialMv(cell.Channels[0]);
        switch (e.Reversal)
        {
            case ReversalRule.Fixed:
                Assert.Equal(e.ReversalMv!.Value, erev);
                break;
            case ReversalRule.Nernst when e.Ion == Ion.Potassium:
                // CODATA 2018 worked check (DOMAIN.md): E_K = -89.1 mV at 37 C with 5 mM out and 140 mM in.
                Assert.Equal(-89.1, erev, 0.05);
                break;
            case ReversalRule.Nernst when e.Ion == Ion.Sodium:
                Assert.Equal(Nernst.PotentialMv(145, 10, 1, 37), erev, 1e-9);
                Assert.InRange(erev, 60, 80);
                break;
            default:
                Assert.Equal(Ion.Calcium, e.Ion); // Nernst or GHK calcium: E_Ca far positive
                Assert.True(erev > 100, $"{key}: E_Ca {erev} mV");
                break;
        }
    }
}
