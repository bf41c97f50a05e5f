using System.Text.RegularExpressions;
using ExprModel.Core.Cell;
using ExprModel.Core.Expression.Identifiers;
using ExprModel.Core.Kinetics;
using ExprModel.Core.Simulation;
using ExprModel.Data.Catalog;
using MathNet.Numerics;

namespace ExprModel.Data.Tests.Catalog;

/// <summary>
/// The entries that close the gene gaps of issue 17 (Nav1.8, Nav1.9, ERG, EAG, ELK, Kv1.4) against the values their sources' pages
/// state, with roots found by MathNet's bracketing root finder (independent of the catalog's bisection), their gene links, the
/// own-family coverage of the neuronal voltage-gated pore genes, and a small simulation that includes them.
/// </summary>
public class GeneGapEntriesTests
{
    private const string Nav18 = "nav18-ttxr-iuphar2005";
    private const string Nav19 = "nav19-persistent-iuphar2005";
    private const string Erg = "kv11-erg-piper2003";
    private const string Eag = "kv10-eag-ludwig1994";
    private const string Elk = "kv12-elk-zou2003";
    private const string Kv14 = "kv14-a-comer1994";

    // CODATA 2018 (exact in the 2019 SI).
    private const double GasConstant = 8.314462618;
    private const double Faraday = 96485.33212;

    private static ChannelEntry Entry(string id) => CatalogFiles.Content.Entries.Where(e => e.Id == id).MaxBy(e => e.Version)!;

    private static GateSpec Gate(string id, string name) => Entry(id).Gates.Single(g => g.Name == name);

    /// <summary>Where the gate's steady state raised to its power (the gate's share of the conductance) crosses one half.</summary>
    private static double ConductanceHalf(GateSpec g) =>
        FindRoots.OfFunction(v => Math.Pow(g.SteadyStateAt(v), g.Power) - 0.5, -150, 80, 1e-9);

    /// <summary>Boltzmann slope factor of the same curve at its half point: k = 1/(4 dG/dV).</summary>
    private static double ConductanceSlope(GateSpec g)
    {
        double v = ConductanceHalf(g), h = 1e-4;
        double d = (Math.Pow(g.SteadyStateAt(v + h), g.Power) - Math.Pow(g.SteadyStateAt(v - h), g.Power)) / (2 * h);
        return 1 / (4 * d);
    }

    /// <summary>Slope factor RT/(zF) in mV for a gating valence z at <paramref name="temperatureC"/>.</summary>
    private static double SlopeFromValence(double z, double temperatureC) => 1000 * GasConstant * (temperatureC + 273.15) / (z * Faraday);

    [Theory]
    [InlineData(Nav18, "Nav-TTXR")]
    [InlineData(Nav19, "Nav-TTXR-persistent")]
    [InlineData(Erg, "Kv11")]
    [InlineData(Eag, "Kv10")]
    [InlineData(Elk, "Kv12")]
    [InlineData(Kv14, "Kv1")]
    public void Each_entry_is_of_its_family_recalled_and_cited_with_its_page(string id, string family)
    {
        var e = Entry(id);
        // Version 2 adds only what the citation check found (issue 17, catalog schema 2).
        Assert.Equal(2, e.Version);
        Assert.NotEmpty(e.Source.CitationNote);
        Assert.Equal(family, e.Family);
        Assert.True(ChannelFamilies.Bands.ContainsKey(family), $"{family} needs a band in ChannelFamilies");
        // Equations are the curator's from stated steady states and recalled time constants: never presented as checked.
        Assert.Equal(Verification.Recalled, e.Source.Verification);
        Assert.Matches(@"https?://", e.Source.Location + " " + e.CuratorNote);
        Assert.NotEmpty(e.PublishedValues);
        Assert.Null(e.Problem());
    }

    [Fact]
    public void Nav18_conductance_midpoint_and_slope_are_the_tabulated_rat_drg_values()
    {
        var m = Gate(Nav18, "m");
        // Catterall et al. 2005 (Pharmacol Rev 57:397), table NaV1.8: Va = -16 to -21 mV; Elliott & Elliott 1993 abstract: slope 4.9 mV.
        Assert.InRange(ConductanceHalf(m), -21, -16);
        Assert.Equal(4.9, ConductanceSlope(m), 0.01);
        // Same table: inactivation about -30 mV, i.e. far more depolarised than TTX-sensitive channels (Elliott & Elliott: +37 mV).
        Assert.Equal(-30, FindRoots.OfFunction(v => Gate(Nav18, "h").SteadyStateAt(v) - 0.5, -120, 40, 1e-9), 1.0);
        Assert.Equal(13.5, Gate(Nav18, "h").TimeConstantAt(-20), 0.5);
        Assert.Equal(5.6, Gate(Nav18, "h").TimeConstantAt(-10), 0.3);
    }

    [Fact]
    public void Nav19_activation_and_inactivation_overlap_into_a_window_current_near_rest()
    {
        var (m, h) = (Gate(Nav19, "m"), Gate(Nav19, "h"));
        // Table NaV1.9: Va = -47 to -54 mV, Vh = -44 to -54 mV; the wide overlap is what makes the current persistent
        // (Dib-Hajj et al. 2002, Trends Neurosci 25:253: "wide overlap between activation and steady-state inactivation").
        Assert.InRange(ConductanceHalf(m), -54, -47);
        Assert.InRange(FindRoots.OfFunction(v => h.SteadyStateAt(v) - 0.5, -120, 40, 1e-9), -54, -44);
        Assert.True(m.SteadyStateAt(-60) * h.SteadyStateAt(-60) > 0.05, "a window current at -60 mV");
        // Table NaV1.9 inactivation time constants, within 10 %.
        foreach (var (v, tau) in new[] { (-60.0, 843.0), (-50, 460), (-20, 43), (-10, 16) })
            Assert.InRange(h.TimeConstantAt(v), 0.9 * tau, 1.1 * tau);
    }

    [Fact]
    public void Erg_slopes_follow_the_papers_valences_and_its_open_fraction_falls_at_positive_potentials()
    {
        // Piper et al. 2003, Fig. 5: G-V z = 2.2, inactivation z = 1.0; room temperature assumed 22 C (recalled).
        Assert.Equal(SlopeFromValence(2.2, 22), ConductanceSlope(Gate(Erg, "a")), 0.01);
        Assert.Equal(-SlopeFromValence(1.0, 22), ConductanceSlope(Gate(Erg, "r")), 0.01);
        Assert.Equal(-9, ConductanceHalf(Gate(Erg, "a")), 0.01);
        // Inward rectification by fast inactivation (Smith, Baukrowitz & Yellen 1996, Nature 379:833): less conductance at +40 than at 0 mV.
        var erg = Entry(Erg);
        Assert.True(erg.SteadyStateOpenFraction(40) < 0.5 * erg.SteadyStateOpenFraction(0));
        // Activation is slow and inactivation fast (Piper et al. 2003 abstract): at 0 mV tau_a exceeds tau_r tenfold.
        Assert.True(Gate(Erg, "a").TimeConstantAt(0) > 10 * Gate(Erg, "r").TimeConstantAt(0));
    }

    [Fact]
    public void Eag_and_elk_activate_where_their_pages_say()
    {
        // Human EAG1 G-V (PMC3434097 Fig. 1B): V0.5 = -4.6 mV, z = 1.83.
        Assert.Equal(-4.6, ConductanceHalf(Gate(Eag, "n")), 0.01);
        Assert.Equal(SlopeFromValence(1.83, 22), ConductanceSlope(Gate(Eag, "n")), 0.02);
        // KCNH8 (Zou et al. 2003 abstract): half-maximal activation at -62 mV; no inactivation gate.
        Assert.Equal(-62, ConductanceHalf(Gate(Elk, "a")), 0.01);
        Assert.Single(Entry(Elk).Gates);
        // ELK opens below the EAG range: subthreshold (abstract: "open at hyperpolarized potentials").
        Assert.True(Entry(Elk).SteadyStateOpenFraction(-60) > 10 * Entry(Eag).SteadyStateOpenFraction(-60));
    }

    [Fact]
    public void Kv14_steady_states_agree_with_both_forms_in_its_abstract_and_recovery_is_slow()
    {
        var (a, b) = (Gate(Kv14, "a"), Gate(Kv14, "b"));
        // Comer et al. 1994 abstract: alpha^3 with V1/2 = -43 mV, k = 13.1 mV, equivalently a simple Boltzmann V1/2 = -25 mV, k = 10 mV.
        Assert.Equal(-25, ConductanceHalf(a), 0.5);
        Assert.Equal(10, ConductanceSlope(a), 1.0);
        Assert.Equal(-57, FindRoots.OfFunction(v => b.SteadyStateAt(v) - 0.5, -120, 40, 1e-9), 0.01);
        // Recovery at -90 mV: half-time 4.8 s (abstract); an exponential recovers half in tau ln 2.
        Assert.InRange(b.TimeConstantAt(-90) * Math.Log(2), 4600, 5000);
        // Kv1 band (DOMAIN.md, from memory) holds the activation gate.
        Assert.InRange(FindRoots.OfFunction(v => a.SteadyStateAt(v) - 0.5, -120, 40, 1e-9), -60, -20);
    }

    [Theory]
    [InlineData("SCN10A", Nav18)]
    [InlineData("SCN11A", Nav19)]
    [InlineData("KCNH2", Erg)]
    [InlineData("KCNH6", Erg)]
    [InlineData("KCNH7", Erg)]
    [InlineData("KCNH1", Eag)]
    [InlineData("KCNH5", Eag)]
    [InlineData("KCNH3", Elk)]
    [InlineData("KCNH4", Elk)]
    [InlineData("KCNH8", Elk)]
    [InlineData("KCNA4", Kv14)]
    public void Gene_feeds_its_own_family_entry_alone_in_every_species(string human, string entryId)
    {
        foreach (var species in new[] { Species.Human, Species.Mouse, Species.Rat })
        {
            string symbol = species == Species.Human ? human : human[0] + human[1..].ToLowerInvariant();
            var link = Assert.Single(CatalogFiles.Content.GeneLinks, l => l.Species == species && l.Symbol == symbol);
            Assert.Equal(entryId, link.EntryId);
            Assert.Equal(1, link.Weight);
        }
        Assert.Equal("linked", CatalogFiles.Content.GeneStatuses.Single(s => s.Species == Species.Human && s.Symbol == human).Status);
    }

    [Fact]
    public void Kcna5_stays_non_neuronal_with_its_reason()
    {
        var s = CatalogFiles.Content.GeneStatuses.Single(x => x.Species == Species.Human && x.Symbol == "KCNA5");
        Assert.Equal("non-neuronal", s.Status);
        Assert.Contains("glia", s.Reason, StringComparison.Ordinal);
        Assert.DoesNotContain(CatalogFiles.Content.GeneLinks, l => l.Symbol.Equals("KCNA5", StringComparison.OrdinalIgnoreCase));
    }

    /// <summary>HGNC gene families (open standard) and the catalog family codes that are "their own".</summary>
    private static readonly (string Pattern, string[] Families)[] OwnFamilies =
    [
        (@"^SCN\d+A$", ["Nav-transient", "Nav-persistent", "Nav-TTXR", "Nav-TTXR-persistent"]),
        (@"^KCNA\d+$", ["Kv1"]),
        (@"^KCNB\d$", ["Kv2"]),
        (@"^KCNC\d$", ["Kv3"]),
        (@"^KCND\d$", ["Kv4"]),
        (@"^KCNQ\d$", ["Kv7"]),
        (@"^KCNH[15]$", ["Kv10"]),
        (@"^KCNH[267]$", ["Kv11"]),
        (@"^KCNH[348]$", ["Kv12"]),
        (@"^HCN\d$", ["HCN"]),
        (@"^CACNA1[GHI]$", ["Cav3"]),
        (@"^CACNA1[A-FS]$", ["Cav-HVA"]),
        (@"^KCNMA1$", ["BK"]),
    ];

    [Fact]
    public void At_least_95_percent_of_neuronal_voltage_gated_pore_genes_feed_an_entry_of_their_own_family()
    {
        var content = CatalogFiles.Content;
        var families = content.Entries.GroupBy(e => e.Id).ToDictionary(g => g.Key, g => g.MaxBy(e => e.Version)!.Family);
        var neuronal = content.GeneStatuses
            .Where(s => s.Species == Species.Human && GeneCoverage.VoltageGatedPoreSymbol.IsMatch(s.Symbol) && s.Status != "non-neuronal")
            .Select(s => s.Symbol).ToArray();
        bool Own(string symbol)
        {
            var own = OwnFamilies.Single(f => Regex.IsMatch(symbol, f.Pattern)).Families;
            var links = content.GeneLinks.Where(l => l.Species == Species.Human && l.Symbol == symbol).ToArray();
            return links.Length > 0 && links.All(l => own.Contains(families[l.EntryId]));
        }
        var missing = neuronal.Where(s => !Own(s)).ToArray();
        double fraction = 1 - (double)missing.Length / neuronal.Length;
        Assert.True(neuronal.Length >= 45, $"only {neuronal.Length} genes counted");
        Assert.True(fraction >= 0.95, $"{neuronal.Length - missing.Length}/{neuronal.Length} own-family ({fraction:P1}); not: {string.Join(" ", missing)}");
    }

    [Fact]
    public void A_sensory_cell_with_all_six_entries_stays_finite_and_fires_on_nav18_alone()
    {
        ChannelInstance At(string id, double density) => new() { Entry = Entry(id), DensityMsPerCm2 = density };
        var channels = new List<ChannelInstance>
        {
            At(Nav18, Entry(Nav18).TypicalDensityMsPerCm2),
            At("traub-kdr", 5),
            At("leak", 0.05),
            At(Nav19, Entry(Nav19).TypicalDensityMsPerCm2),
            At(Erg, Entry(Erg).TypicalDensityMsPerCm2),
            At(Eag, Entry(Eag).TypicalDensityMsPerCm2),
            At(Elk, Entry(Elk).TypicalDensityMsPerCm2),
            At(Kv14, Entry(Kv14).TypicalDensityMsPerCm2),
        };
        CompiledCell Cell(IEnumerable<ChannelInstance> list) => new(new CellModel
        {
            Geometry = Geometry.FromDiameter(25),
            TemperatureC = 36,
            InitialVoltageMv = -65,
            Channels = list.ToList(),
        });
        var full = Simulator.Run(Cell(channels), new StepCurrent(50, 300, 15), 400);
        Assert.All(full.VoltageMv, v => Assert.True(double.IsFinite(v) && v is > -130 and < 90, $"V = {v} mV"));
        // Nociceptors fire TTX-resistant action potentials carried by Nav1.8 (Akopian et al. 1999, Nat Neurosci 2:541: sns-null cells
        // lose the slow TTX-resistant current); with Nav1.8 as the only sodium entry the cell still fires.
        var ttxr = Simulator.SpikeTimes(Cell(channels.Take(3)), [new StepCurrent(50, 300, 15)], 400)[0];
        Assert.NotEmpty(ttxr);
    }
}
