using ExprModel.Core.Perturbation;

namespace ExprModel.Core.Tests.Perturbation;

public class FitTargetReaderTests
{
    [Fact]
    public void Typed_targets_take_the_readouts_unit_or_its_absolute_form()
    {
        var a = FitTargetReader.ParseTyped("resting_potential=-68.5 mV");
        Assert.Equal(("resting_potential", -68.5, 1.0), (a.Readout, a.Value, a.Scale));
        var b = FitTargetReader.ParseTyped("rheobase=45pA");
        Assert.Equal("rheobase_absolute", b.Readout);
        Assert.Equal(0.05 * 45, b.Scale, 12);
        Assert.Equal(180, FitTargetReader.ParseTyped("input_resistance=180MΩ").Value);
        Assert.Equal(0.3, FitTargetReader.ParseTyped("adaptation_ratio=1.5", 0.3).Scale);
    }

    [Theory]
    [InlineData("rheobase", "NAME=VALUE")]
    [InlineData("rheobase=abc", "does not start with a number")]
    [InlineData("rheobse=1", "'rheobse' is not a read-out")]
    [InlineData("spike_half_width=1 mV", "spike_half_width is in ms, not 'mV'")]
    [InlineData("excitability_class=1", "discrete")]
    public void Bad_typed_targets_say_what_is_wrong(string text, string expected) =>
        Assert.Contains(expected, Assert.Throws<ArgumentException>(() => FitTargetReader.ParseTyped(text)).Message);

    [Fact]
    public void A_targets_table_is_read_with_scales_and_errors_name_line_and_column()
    {
        var t = FitTargetReader.ReadCsv("# recorded in slice\nreadout,value,unit,scale\nrheobase_absolute,45,pA,5\nresting_potential,-70,mV,\n", "t.csv");
        Assert.Equal(2, t.Count);
        Assert.Equal(5, t[0].Scale);
        Assert.Equal(1, t[1].Scale);
        Assert.Contains("t.csv: line 2, column 2", Assert.Throws<ArgumentException>(() => FitTargetReader.ReadCsv("readout,value,unit\nrheobase,x,uA/cm2\n",
            "t.csv")).Message);
        Assert.Contains("line 3: rheobase is given twice",
            Assert.Throws<ArgumentException>(() => FitTargetReader.ReadCsv("readout,value,unit\nrheobase,1,\nrheobase,2,\n", "t.csv")).Message);
        Assert.Contains("header", Assert.Throws<ArgumentException>(() => FitTargetReader.ReadCsv("rheobase,1,uA/cm2\n", "t.csv")).Message);
        Assert.Contains("column 4", Assert.Throws<ArgumentException>(() => FitTargetReader.ReadCsv("readout,value,unit,scale\nrheobase,1,,-2\n",
            "t.csv")).Message);
    }
}
