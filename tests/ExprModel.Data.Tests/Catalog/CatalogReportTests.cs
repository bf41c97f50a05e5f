using ExprModel.Core.Expression.Identifiers;
using ExprModel.Core.Mapping;
using ExprModel.Data.Catalog;

namespace ExprModel.Data.Tests.Catalog;

public class CatalogReportTests
{
    private static readonly Lazy<ChannelCatalog> Built = new(() =>
    {
        var db = Path.Combine(Path.GetTempPath(), $"exprmodel-catalog-report-{Guid.NewGuid():N}.db");
        CatalogBuilder.Build(CatalogFiles.Sources(), db);
        return ChannelCatalog.Open(db);
    });

    [Fact]
    public void Report_shows_every_entry_with_citation_verification_and_a_curve_table()
    {
        var catalog = Built.Value;
        var text = CatalogReport.Markdown(catalog);
        foreach (var e in catalog.Latest)
        {
            var section = CatalogReport.Entry(e);
            Assert.Contains($"## {e.Key}: {e.Name}", text);
            Assert.Contains(e.Source.Authors, section);
            Assert.Contains(e.Family, section);
            Assert.Contains(e.Source.Verification == Core.Kinetics.Verification.Recalled ? "RECALLED" : "checked against the paper", section);
            if (e.Source.Doi.Length > 0) Assert.Contains(e.Source.Doi, section);
            // Citation and parameters are reported separately (issue 17).
            Assert.Contains("- Citation: " + CatalogReport.CitationStatus(e.Source), section);
            Assert.Contains("- Parameters: " + CatalogReport.ParameterStatus(e.Source), section);
            if (e.Source.CitationCheck == Core.Kinetics.CitationCheck.Confirmed) Assert.Contains(e.Source.CitationCheckedAt, section);
            if (e.Gates.Count > 0)
                // 15 rows, -100..+40 mV in 10 mV steps, plus header and rule.
                Assert.Equal(17, CatalogReport.Table(e).Split('\n', StringSplitOptions.RemoveEmptyEntries).Length);
        }
    }

    [Fact]
    public void Report_states_the_half_activation_and_time_constants_the_sources_give()
    {
        var catalog = Built.Value;
        // Golomb et al. 2007 (PLoS Comput Biol 3:e156): I_Kd a_inf half-activation -50 mV, tau_a 2 ms, tau_b 150 ms.
        var kd = CatalogReport.Entry(catalog.Resolve("kv1-d-golomb2007", 1));
        Assert.Contains("half-activation -50.0 mV", kd);
        Assert.Contains("tau 150 to 150 ms", kd);
        // Mainen & Sejnowski 1996 M-current: symmetric rates cross at -30 mV; tau there 1/(2 x 0.009) = 55.6 ms.
        var m = CatalogReport.Entry(catalog.Resolve("kv7-m-mainen1996", 1));
        Assert.Contains("half-activation -30.0 mV", m);
        Assert.Contains("55.56 ms", m);
        // Kohler et al. 1996: SK2 half-activation 0.63 uM calcium.
        Assert.Contains("calcium half-activation 0.63 uM", CatalogReport.Entry(catalog.Resolve("sk2-kohler1996", 1)));
    }

    [Fact]
    public void Gene_rows_list_every_status_and_rodent_links_and_write_csv()
    {
        var catalog = Built.Value;
        var rows = GeneCoverage.Rows(catalog);
        Assert.Equal(catalog.GeneStatuses.Count, rows.Count(r => r.Species == Species.Human));
        var scn8a = rows.Single(r => r.Species == Species.Human && r.Symbol == "SCN8A");
        Assert.Equal("linked", scn8a.Status);
        Assert.Contains("traub-na", scn8a.Entries);
        Assert.Contains("nap-ca1-golomb2006", scn8a.Entries);
        Assert.Contains("nap-ca1-golomb2006:0.5", rows.Single(r => r.Species == Species.Human && r.Symbol == "SCN1A").Entries);
        Assert.Contains(rows, r => r.Species == Species.Mouse && r.Symbol == "Kcnq2" && r.Status == "linked");
        Assert.Contains(rows, r => r.Species == Species.Rat && r.Symbol == "Hcn1" && r.Status == "linked");
        var csv = GeneCoverage.ToCsv(rows).Split('\n', StringSplitOptions.RemoveEmptyEntries);
        Assert.Equal("symbol,species,status,entries", csv[0]);
        Assert.Equal(rows.Count + 1, csv.Length);
        Assert.Contains("SCN5A,human,non-neuronal,", csv);
        // Issue 17 gave the former proxy genes (KCNH1 was linked to Kv2) entries of their own family; the report lists proxies only
        // while some exist (the proxy marking itself is tested on a synthetic link in ExpressionModelBuilderTests).
        var kcnh1 = rows.Single(r => r.Species == Species.Human && r.Symbol == "KCNH1");
        Assert.Equal("linked", kcnh1.Status);
        Assert.Equal(new[] { "kv10-eag-ludwig1994" }, kcnh1.Entries);
        Assert.Equal(catalog.GeneLinks.Any(l => l.IsProxy), CatalogReport.Markdown(catalog).Contains("Proxy links (human; mouse and rat follow)",
            StringComparison.Ordinal));
    }

    [Fact]
    public void Coverage_figure_counts_neuronal_voltage_gated_pores()
    {
        var figure = GeneCoverage.VoltageGatedPoreCoverage(Built.Value);
        // Only links to kinetics of the gene's own family count (GeneLinkTests holds the floor against the Debian package).
        Assert.True(figure.Fraction >= 0.95, $"{figure.Linked}/{figure.Total}: {string.Join(" ", figure.Unlinked)}");
        var proxied = Built.Value.GeneLinks.Where(l => l.Species == Species.Human && l.IsProxy).Select(l => l.Symbol).ToHashSet();
        var own = Built.Value.GeneLinks.Where(l => l.Species == Species.Human && !l.IsProxy).Select(l => l.Symbol).ToHashSet();
        Assert.All(proxied.Where(s => !own.Contains(s) && GeneCoverage.VoltageGatedPoreSymbol.IsMatch(s)), s =>
        {
            Assert.Contains(s, figure.Unlinked);
            Assert.Contains(s, figure.ProxyOnly);
        });
        Assert.DoesNotContain("SCN5A", figure.Unlinked); // non-neuronal genes are outside the denominator
        Assert.DoesNotContain("SCN10A", figure.Unlinked); // Nav1.8 has its own entry since issue 17
        // The report names the unlinked genes, or says there are none (not an empty list).
        string report = CatalogReport.Markdown(Built.Value);
        Assert.Contains(figure.Unlinked.Count == 0 ? "; none unlinked." : "; unlinked: " + string.Join(", ", figure.Unlinked), report);
    }
}
