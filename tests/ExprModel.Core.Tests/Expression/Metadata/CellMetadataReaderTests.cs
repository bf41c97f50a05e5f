using ExprModel.Core.Expression;
using ExprModel.Core.Expression.Metadata;

namespace ExprModel.Core.Tests.Expression.Metadata;

public sealed class CellMetadataReaderTests : IDisposable
{
    private readonly TempFiles _files = new();
    public void Dispose() => _files.Dispose();

    private const string Table =
        "cell_id,group,layer,resting potential (mV),input_resistance_MOhm,rheobase [pA],slice\n" +
        "c1,fast,L2,-68.5,120,NA,s1\n" +
        "c2,adapting,L5,-71,,45.5,s1\n" +
        "c3,fast,L5,,95.25,60,s2\n";

    [Fact]
    public void SplitsIdLabelsAndRecordedColumnsWithUnits()
    {
        var m = CellMetadataReader.Read(_files.Text("meta.csv", Table));
        Assert.Equal("cell_id", m.CellIdColumn);
        Assert.Equal(["c1", "c2", "c3"], m.CellIds);
        Assert.Equal(["group", "layer", "slice"], m.Labels.Keys.Order());
        Assert.Equal(["fast", "adapting"], m.Groups("group"));
        Assert.Equal(["c1", "c3"], m.CellsIn("group", "fast"));
        Assert.Equal("adapting", m.Label("group", "c2"));

        var rest = m.RecordedColumn("resting potential")!;
        Assert.Equal("mV", rest.Unit);
        Assert.Equal([-68.5, -71.0, null], rest.Values);
        var rin = m.RecordedColumn("input_resistance")!;
        Assert.Equal("MOhm", rin.Unit);
        Assert.Equal([120.0, null, 95.25], rin.Values);
        var rheobase = m.RecordedColumn("rheobase [pA]")!;
        Assert.Equal("pA", rheobase.Unit);
        Assert.Equal([null, 45.5, 60.0], rheobase.Values);
    }

    [Fact]
    public void ChosenGroupColumns_OnlyThoseAreLabels()
    {
        var m = CellMetadataReader.Read(_files.Text("meta.tsv", Table.Replace(',', '\t')), new() { GroupColumns = ["group"] });
        Assert.Equal(["group"], m.Labels.Keys);
        Assert.Contains(m.Notes, n => n.Contains("'layer'") && n.Contains("ignored"));
    }

    [Fact]
    public void MissingChosenColumn_IsAnErrorNamingIt()
    {
        var e = Assert.Throws<ExpressionFormatException>(() =>
            CellMetadataReader.Read(_files.Text("meta.csv", Table), new() { GroupColumns = ["cluster"] }));
        Assert.Contains("'cluster'", e.Message);
        Assert.Contains("line 1", e.Message);
    }

    [Theory]
    [InlineData("Vrest (mV)", "Vrest", "mV")]
    [InlineData("max rate [Hz]", "max rate", "Hz")]
    [InlineData("rheobase_pA", "rheobase", "pA")]
    [InlineData("sag ratio", "sag ratio", null)]
    public void HeaderUnits(string header, string name, string? unit) =>
        Assert.Equal((name, unit), ColumnHeader.Split(header));
}
