using ExprModel.Core.Confrontation;
using ExprModel.Data.Demo;
using ExprModel.Data.Tests.Catalog;

namespace ExprModel.Data.Tests.Demo;

/// <summary>
/// The committed catalog/demo/recorded-features.csv is exactly what <see cref="DemoRecordedFeatures"/> measures from the
/// committed recordings (which the recording generator's own test ties to its seed). Set EXPRMODEL_WRITE_DEMO=1 to
/// rewrite it (then commit the result).
/// </summary>
public sealed class DemoRecordedFeaturesTests
{
    private static string DemoDir => Path.Combine(CatalogFiles.Directory, "demo");

    [Fact]
    public void CommittedFile_IsExactlyWhatTheRecordingsMeasure()
    {
        if (Environment.GetEnvironmentVariable("EXPRMODEL_WRITE_DEMO") == "1") DemoRecordedFeatures.WriteTo(DemoDir);
        Assert.Equal(DemoRecordedFeatures.Create(DemoDir), File.ReadAllText(Path.Combine(DemoDir, DemoRecordedFeatures.FileName)));
    }

    [Fact]
    public void Table_IsReadByTheRecordedFeatureReader_WithItsColumnsMatchedToReadouts()
    {
        var table = RecordedFeatureReader.Read(Path.Combine(DemoDir, DemoRecordedFeatures.FileName));
        Assert.Equal("cell_id", table.CellIdColumn);
        Assert.Equal(15, table.CellIds.Count);
        var features = ReadoutMatcher.Match(table, _ => true);
        var matched = features.Readouts.Select(r => r.Readout).ToHashSet();
        foreach (var name in new[] { "resting_potential", "input_resistance", "membrane_time_constant", "sag_ratio", "rheobase_absolute",
            "spike_threshold", "fi_gain_absolute" })
            Assert.Contains(name, matched);
        // FH3002's only crossing of the detection level is not regenerative (largest rise under 1 mV/ms): no rheobase.
        var rheobase = features.Readouts.Single(r => r.Readout == "rheobase_absolute");
        Assert.False(rheobase.ValueByCell.ContainsKey("FH3002"));
        Assert.Equal(80, rheobase.ValueByCell["FH1001"]); // the demo family's steps are 40 pA apart
    }
}
