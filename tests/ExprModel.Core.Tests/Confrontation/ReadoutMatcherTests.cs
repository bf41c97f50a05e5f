using ExprModel.Core.Confrontation;
using ExprModel.Core.Expression;
using ExprModel.Core.Tests.Expression;
using ExprModel.Data.Catalog;

namespace ExprModel.Core.Tests.Confrontation;

public sealed class ReadoutMatcherTests : IDisposable
{
    private readonly TempFiles _files = new();
    public void Dispose() => _files.Dispose();

    private static bool Any(string _) => true;

    private RecordedFeatures Match(string csv, Dictionary<string, string>? overrides = null, Func<string, bool>? known = null) =>
        ReadoutMatcher.Match(RecordedFeatureReader.Read(_files.Text("recorded.csv", csv)), known ?? Any, overrides);

    [Fact]
    public void TheDemoTableMatchesThreeColumnsAndSaysWhyTheOthersAreLeftOut()
    {
        var path = Path.Combine(CatalogLocator.FindSourceDirectory()!, "demo", "metadata.csv");
        var f = ReadoutMatcher.Match(RecordedFeatureReader.Read(path), Any);
        Assert.Equal(["resting_potential", "input_resistance", "rheobase_absolute"], f.Readouts.Select(r => r.Readout));
        var byHeader = f.Matches.ToDictionary(m => m.Header);
        Assert.Equal("pA", byHeader["rheobase (pA)"].ReadoutUnit);
        Assert.Contains("label column", byHeader["group"].Reason);
        var rate = byHeader["max firing rate (Hz)"];
        Assert.False(rate.Matched);
        Assert.Contains("step family", rate.Reason);
        // The demo README: about a third of the 240 cells were recorded.
        Assert.InRange(f.RecordedCells.Count, 60, 100);
        Assert.Equal(167.0, f.Readouts[2].ValueByCell["FH1001"]);
    }

    [Fact]
    public void UnitsChooseTheReadoutAndConvertThroughTheUnitModule()
    {
        var f = Match("cell,Rheobase [nA],Input Resistance (GOhm),rheobase_absolute_pA\nc1,0.12,0.3,\nc2,0.2,0.25,\n");
        var rheobase = f.Readouts.Single(r => r.Header == "Rheobase [nA]");
        Assert.Equal("rheobase_absolute", rheobase.Readout);
        Assert.Equal(120, rheobase.InReadoutUnit(rheobase.ValueByCell["c1"], null), 9);
        var rin = f.Readouts.Single(r => r.Readout == "input_resistance");
        Assert.Equal(300, rin.InReadoutUnit(rin.ValueByCell["c1"], null), 9);
        // A second column for the same read-out is left out, naming the first.
        var second = f.Matches.Single(m => m.Header == "rheobase_absolute_pA");
        Assert.False(second.Matched);
        Assert.Contains("Rheobase [nA]", second.Reason);
    }

    [Fact]
    public void ADensityColumnMatchesTheDensityReadoutAndAUserMapConvertsWithTheArea()
    {
        var f = Match("cell,rheobase (uA/cm2)\nc1,1.5\n");
        Assert.Equal("rheobase", f.Readouts.Single().Readout);
        var mapped = Match("cell,threshold current (pA)\nc1,10\n", new() { ["threshold current"] = "rheobase" });
        var r = mapped.Readouts.Single();
        Assert.True(mapped.Matches.Single().ByUser);
        Assert.Contains("membrane area", mapped.Matches.Single().Reason);
        // DOMAIN.md: 10 pA on 1000 um2 is 1 uA/cm2.
        Assert.Equal(1.0, r.InReadoutUnit(r.ValueByCell["c1"], 1000), 12);
    }

    [Fact]
    public void TheUserCanLeaveAColumnOutOrMapOneTheNameDoesNotMatch()
    {
        var f = Match("cell,Vrest (mV),resting potential (mV)\nc1,-70,-71\n", new() { ["Vrest (mV)"] = "resting_potential", ["resting potential"] = "none" });
        Assert.Equal("Vrest (mV)", f.Readouts.Single().Header);
        Assert.Equal("left out by the user.", f.Matches.Single(m => m.Header == "resting potential (mV)").Reason);
        var e = Assert.Throws<ArgumentException>(() => Match("cell,Vrest (mV)\nc1,-70\n", new() { ["Vrest"] = "resting_voltage" }));
        Assert.Contains("no read-out 'resting_voltage'", e.Message);
        var c = Assert.Throws<ArgumentException>(() => Match("cell,Vrest (mV)\nc1,-70\n", new() { ["Rin"] = "input_resistance" }));
        Assert.Contains("no such value column", c.Message);
        var u = Assert.Throws<ArgumentException>(() => Match("cell,Vrest (mV)\nc1,-70\n", new() { ["Vrest"] = "input_resistance" }));
        Assert.Contains("cannot be compared", u.Message);
    }

    [Fact]
    public void BadInputIsAnErrorNamingFileLineAndColumn()
    {
        var unit = Assert.Throws<ExpressionFormatException>(() => Match("cell,slice,input resistance (mOhm)\nc1,s1,120\n"));
        Assert.StartsWith("recorded.csv: line 1, column 3: unknown unit 'mOhm'", unit.Message);
        var number = Assert.Throws<ExpressionFormatException>(() => Match("cell,rheobase (pA)\nc1,120\nc2,12O\n"));
        Assert.StartsWith("recorded.csv: line 3, column 2: '12O'", number.Message);
        var cell = Assert.Throws<ExpressionFormatException>(() => Match("id,rheobase (pA)\nc1,120\nc9,80\n", known: id => id == "c1"));
        Assert.StartsWith("recorded.csv: line 3, column 1: cell 'c9'", cell.Message);
        var twice = Assert.Throws<ExpressionFormatException>(() => Match("cell,rheobase (pA)\nc1,120\nc1,80\n"));
        Assert.Contains("line 3, column 1: cell 'c1' appears twice (also line 2)", twice.Message);
    }

    [Fact]
    public void ColumnsWithoutAUnitOrWithAnUnknownNameAreReportedNotGuessed()
    {
        var f = Match("cell,rheobase,sag (mV),notes\nc1,120,3,ok\n");
        Assert.Empty(f.Readouts);
        Assert.Contains("states no unit", f.Matches[0].Reason);
        Assert.Contains("no read-out is named 'sag'", f.Matches[1].Reason);
        Assert.Contains("label column", f.Matches[2].Reason);
        // A name that matches but a unit of another quantity.
        var g = Match("cell,rheobase (mV)\nc1,5\n");
        Assert.Contains("does not measure", g.Matches.Single().Reason);
    }
}
