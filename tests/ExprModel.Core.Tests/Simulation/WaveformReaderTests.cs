using ExprModel.Core.Simulation;

namespace ExprModel.Core.Tests.Simulation;

public class WaveformReaderTests
{
    [Fact]
    public void Reads_a_header_comments_and_any_of_three_separators()
    {
        var w = WaveformReader.Read("# my pulse\ntime_ms,current_pa\n0,0\n10;2.5\n\n20\t-1\n", "w.csv", v => v / 10);
        Assert.Equal([0.0, 10, 20], w.TimesMs);
        Assert.Equal([0.0, 0.25, -0.1], w.DensitiesUaPerCm2);
        Assert.Equal(0.125, w.DensityAt(5), 12); // linear between samples
        Assert.Equal(0, w.DensityAt(25));
    }

    [Theory]
    [InlineData("t,i\n0,0\n1,abc\n", "w.csv: line 3, column 2: 'abc' is not a current.")]
    [InlineData("0,0\nx,1\n", "w.csv: line 2, column 1: 'x' is not a time in ms.")]
    [InlineData("0,0\n2,1\n1,1\n", "w.csv: line 3, column 1: times must increase (1 ms follows 2 ms).")]
    [InlineData("0,0\n5\n", "w.csv: line 2: expected two columns (time_ms, current), found one.")]
    [InlineData("time,current\n0,1\n", "w.csv: needs at least two samples (time_ms, current), found 1.")]
    public void Bad_text_is_refused_naming_line_and_column(string text, string message)
    {
        var e = Assert.Throws<WaveformFormatException>(() => WaveformReader.Read(text, "w.csv", v => v));
        Assert.Equal(message, e.Message);
    }
}
