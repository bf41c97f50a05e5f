using ExprModel.Core.Kinetics;
using ExprModel.Data.Catalog;

namespace ExprModel.Data.Tests.Catalog;

/// <summary>
/// Issue 17: every entry's citation compared with the paper's PubMed or journal abstract page (address recorded), or the
/// entry says why it could not be; the DOIs those pages give; the citation check shown apart from the parameters' status.
/// </summary>
public class EntryCitationTests
{
    private static IEnumerable<ChannelEntry> Latest =>
        CatalogFiles.Content.Entries.GroupBy(e => e.Id).Select(g => g.MaxBy(e => e.Version)!);

    [Fact]
    public void Every_latest_entry_records_what_the_citation_check_found()
    {
        var silent = Latest.Where(e => e.Source.CitationNote.Length == 0).Select(e => e.Key).ToArray();
        Assert.True(silent.Length == 0, "no citationNote: " + string.Join(", ", silent));
    }

    [Fact]
    public void Confirmed_citations_name_a_paper_page_never_a_simulator_or_model_database()
    {
        // Only the papers' own pages count: PubMed and PubMed Central abstract pages, the journals' sites, and a
        // scholarly-journal copy of the article's first page. A new kind of page must be added here on purpose.
        string[] paperHosts = ["ncbi.nlm.nih.gov", "physiology.org", "jneurosci.org", "cell.com", "nature.com", "springer.com", "proquest.com"];
        foreach (var e in Latest.Where(e => e.Source.CitationCheck == CitationCheck.Confirmed))
        {
            var host = new Uri(e.Source.CitationCheckedAt).Host;
            Assert.True(paperHosts.Any(h => host == h || host.EndsWith("." + h, StringComparison.OrdinalIgnoreCase)),
                $"{e.Key}: citation confirmed at {host}, which is not a paper's page");
        }
    }

    [Theory]
    // DOIs as the papers' PubMed pages give them (issue 17): Golomb et al. 2006 (PMID 16807352), Rothman & Manis 2003
    // (PMID 12783953), Wolf et al. 2005, Jaffe et al. 1994 (PMID 8201402), Lu et al. 2007 (PMID 17448995; the NALCN paper).
    [InlineData("nap-ca1-golomb2006", "10.1152/jn.00205.2006")]
    [InlineData("kv7-m-golomb2006", "10.1152/jn.00205.2006")]
    [InlineData("nav-ca1-golomb2006", "10.1152/jn.00205.2006")]
    [InlineData("kdr-ca1-golomb2006", "10.1152/jn.00205.2006")]
    [InlineData("kv4-a-golomb2006", "10.1152/jn.00205.2006")]
    [InlineData("kv1-klt-rothman2003", "10.1152/jn.00127.2002")]
    [InlineData("hcn-vcn-rothman2003", "10.1152/jn.00127.2002")]
    [InlineData("nav-vcn-rothman2003", "10.1152/jn.00127.2002")]
    [InlineData("kir2-msn-wolf2005", "10.1523/JNEUROSCI.2220-05.2005")]
    [InlineData("cav1-l-jaffe1994", "10.1152/jn.1994.71.3.1065")]
    [InlineData("cav22-n-ca1-1994", "10.1152/jn.1994.71.3.1065")]
    [InlineData("nalcn-leak", "10.1016/j.cell.2007.02.041")]
    public void Latest_versions_carry_the_DOI_of_the_paper_s_PubMed_page(string id, string doi)
    {
        var e = Latest.Single(x => x.Id == id);
        Assert.Equal(doi, e.Source.Doi);
        Assert.Equal(CitationCheck.Confirmed, e.Source.CitationCheck);
        // The citation check says nothing about the parameters: they stay recalled until the equations are read.
        Assert.Equal(Verification.Recalled, e.Source.Verification);
    }

    [Fact]
    public void Golomb_2007_sodium_entry_says_the_paper_varies_theta_m_and_uses_fixed_reversal_potentials()
    {
        var note = Latest.Single(x => x.Id == "nav-fs-golomb2007").CuratorNote;
        Assert.Contains("varies the sodium activation half-point", note);
        Assert.Contains("-28 mV", note);
        Assert.Contains("fixed reversal potentials", note);
    }

    [Fact]
    public void Citation_only_versions_keep_the_kinetics_and_densities_of_the_version_before()
    {
        foreach (var e in Latest.Where(e => e.Version > 1 && e.Id != "nap-prebotc-butera1999"))
        {
            var before = CatalogFiles.Content.Entries.Single(x => x.Id == e.Id && x.Version == e.Version - 1);
            if (before.Source.CitationCheck != CitationCheck.Unchecked || before.Source.CitationNote.Length > 0) continue;
            Assert.Equal(EntryFile.Write(before with { Version = e.Version, Source = e.Source, CuratorNote = e.CuratorNote }), EntryFile.Write(e));
        }
    }
}
