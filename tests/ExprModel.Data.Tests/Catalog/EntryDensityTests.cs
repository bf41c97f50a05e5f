using System.Text.RegularExpressions;
using ExprModel.Core.Kinetics;

namespace ExprModel.Data.Tests.Catalog;

/// <summary>
/// Each entry's typical density against what its own source says: the structured <c>sourceDensity</c> (the paper's
/// conductance with its capacitance or area), and a curator note that states a conductance in nS must carry one.
/// </summary>
public class EntryDensityTests
{
    /// <summary>Typical densities are written to three significant figures: 0.5 % covers the rounding.</summary>
    private const double RoundingTolerance = 0.005;

    public static TheoryData<string> EntriesWithSourceDensity()
    {
        var data = new TheoryData<string>();
        foreach (var e in CatalogFiles.Content.Entries.Where(e => e.SourceDensity is not null)) data.Add(e.Key);
        return data;
    }

    [Theory]
    [MemberData(nameof(EntriesWithSourceDensity))]
    public void Typical_density_follows_the_paper_s_stated_conductance(string key)
    {
        var e = CatalogFiles.Content.Entries.Single(x => x.Key == key);
        double paper = e.SourceDensity!.MsPerCm2;
        Assert.True(Math.Abs(e.TypicalDensityMsPerCm2 - paper) <= RoundingTolerance * paper,
            $"{key}: typical {e.TypicalDensityMsPerCm2} mS/cm2 but the paper's {e.SourceDensity.Describe()}");
        Assert.InRange(paper, e.MinDensityMsPerCm2, e.MaxDensityMsPerCm2);
    }

    [Fact]
    public void Latest_entries_whose_note_states_a_conductance_in_nS_carry_it_as_source_density()
    {
        // "2.8 nS in a 21 pF cell": a number, nS, and a capacitance in pF in the same note.
        var stated = new Regex(@"\b\d+(\.\d+)?\s*nS\b.*\b\d+(\.\d+)?\s*pF\b", RegexOptions.CultureInvariant);
        var latest = CatalogFiles.Content.Entries.GroupBy(e => e.Id).Select(g => g.MaxBy(e => e.Version)!);
        var missing = latest.Where(e => stated.IsMatch(e.CuratorNote) && e.SourceDensity is null).Select(e => e.Key).ToArray();
        Assert.True(missing.Length == 0, "note states nS in pF but no sourceDensity: " + string.Join(", ", missing));
    }

    [Fact]
    public void Butera_persistent_sodium_version_2_is_the_paper_s_nS_value_over_its_capacitance()
    {
        // Issue 17: version 1 read 2.8 nS (in 21 pF) as 2.8 mS/cm2; version 2 holds 2.8 nS / 21 pF = 0.133 mS/cm2 at 1 uF/cm2.
        var v1 = CatalogFiles.Content.Entries.Single(e => e.Key == "nap-prebotc-butera1999@1");
        var v2 = CatalogFiles.Content.Entries.Single(e => e.Key == "nap-prebotc-butera1999@2");
        Assert.Equal(2.8, v1.TypicalDensityMsPerCm2);
        Assert.Equal(0.1333, v2.SourceDensity!.MsPerCm2, 4);
        Assert.Equal(0.133, v2.TypicalDensityMsPerCm2);
        Assert.Equal(v1.Gates.Count, v2.Gates.Count);
    }
}
