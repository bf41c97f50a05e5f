using System.Globalization;
using System.Text;
using ExprModel.Core.Recordings;
using ExprModel.Core.Tests.Expression;

namespace ExprModel.Core.Tests.Recordings;

/// <summary>Plain text traces: one file per sweep or a long table with a sweep column, units from the headers, located errors.</summary>
public sealed class TraceCsvReaderTests : IDisposable
{
    private readonly TempFiles _files = new();
    public void Dispose() => _files.Dispose();

    /// <summary>A sweep as text in the given units (time in s or ms, V in V or mV, I in nA or pA).</summary>
    private static string Rows(RecordedSweep s, bool seconds, bool volts, bool nanoamps, int? sweepColumn = null)
    {
        var sb = new StringBuilder();
        for (int i = 0; i < s.VoltageMv.Length; i++)
        {
            double t = i * s.SampleIntervalMs;
            if (sweepColumn is { } n) sb.Append(n).Append(',');
            sb.Append((seconds ? t / 1000 : t).ToString("R", CultureInfo.InvariantCulture)).Append(',')
              .Append((volts ? s.VoltageMv[i] / 1000 : s.VoltageMv[i]).ToString("R", CultureInfo.InvariantCulture)).Append(',')
              .Append((nanoamps ? s.CurrentPa[i] / 1000 : s.CurrentPa[i]).ToString("R", CultureInfo.InvariantCulture)).Append('\n');
        }
        return sb.ToString();
    }

    [Fact]
    public void OneFilePerSweep_InMillivoltsAndPicoamps_GivesTheSameReadoutsAsTheFamily()
    {
        var family = SyntheticSweeps.Family(0.05);
        foreach (var s in family.Sweeps)
            _files.Text($"cellA/cellA_sweep_{s.SweepNumber:D2}.csv", "time (ms),V (mV),I (pA)\n" + Rows(s, false, false, false));
        var cell = Assert.Single(RecordingReader.Read(Path.Combine(_files.Dir, "cellA")));
        Assert.Equal("cellA", cell.CellId);
        Assert.Equal([1, 2, 3, 4, 5, 6], cell.Sweeps.Select(s => s.SweepNumber));
        var r = RecordingFeatures.Measure(cell).Readouts;
        Assert.Equal(200, r.InputResistanceMOhm!.Value, 6);
        Assert.Equal(0.75, r.HalfWidthMs!.Value, 6);
    }

    [Fact]
    public void LongTable_InSecondsVoltsAndNanoamps_IsConvertedToMsMvPa()
    {
        var family = SyntheticSweeps.Family(0.05);
        var text = "sweep,time (s),V (V),I (nA)\n" + string.Concat(family.Sweeps.Select(s => Rows(s, true, true, true, s.SweepNumber)));
        var cell = Assert.Single(RecordingReader.Read(_files.Text("long.csv", text)));
        Assert.Equal("long", cell.CellId);
        Assert.Equal(6, cell.Sweeps.Count);
        Assert.Equal(0.05, cell.Sweeps[0].SampleIntervalMs, 9);
        Assert.Equal(-20, cell.Sweeps[0].Step!.AmplitudePa, 9);
        Assert.Equal(-65, cell.Sweeps[0].VoltageMv[0], 9);
    }

    public static TheoryData<string, string, string> Bad() => new()
    {
        { "bad_number.csv", "time (ms),V (mV),I (pA)\n0,-65,0\n0.05,-6x5,0\n0.1,-65,0\n", "bad_number.csv: line 3, column 2: '-6x5' is not a number" },
        { "no_time.csv", "V (mV),I (pA)\n-65,0\n", "no_time.csv: line 1: no time column" },
        { "no_unit.csv", "time (ms),V,I (pA)\n0,-65,0\n", "no_unit.csv: line 1, column 2: the membrane potential column 'V' states no unit" },
        { "bad_unit.csv", "time (ms),V (mV),I (furlong)\n0,-65,0\n", "bad_unit.csv: line 1, column 3: unit 'furlong'" },
        { "backwards.csv", "time (ms),V (mV),I (pA)\n0,-65,0\n0.05,-65,0\n0.04,-65,0\n", "backwards.csv: line 4, column 1: time does not increase" },
        { "uneven.csv", "time (ms),V (mV),I (pA)\n0,-65,0\n0.05,-65,0\n0.1,-65,0\n0.2,-65,0\n", "uneven.csv: line 5, column 1: time step" },
        { "slow.csv", "time (ms),V (mV),I (pA)\n0,-65,0\n1,-65,0\n2,-65,0\n", "slow.csv: line 2: sweep 1 is sampled at 1000 Hz" },
        { "ragged.csv", "time (ms),V (mV),I (pA)\n0,-65\n", "ragged.csv: line 2, column 3: 2 fields" },
        { "empty_value.csv", "time (ms),V (mV),I (pA)\n0,,0\n", "empty_value.csv: line 2, column 2: empty membrane potential" },
        { "split_sweep.csv", "sweep,time (ms),V (mV),I (pA)\n1,0,-65,0\n1,0.05,-65,0\n1,0.1,-65,0\n2,0,-65,0\n2,0.05,-65,0\n2,0.1,-65,0\n1,0.15,-65,0\n",
            "split_sweep.csv: line 8, column 1: sweep 1 starts again" },
        { "empty.csv", "", "empty.csv: line 1: the file is empty" },
    };

    [Theory]
    [MemberData(nameof(Bad))]
    public void BadTable_NamesLineAndColumn(string name, string content, string expected)
    {
        var e = Assert.Throws<RecordingFormatException>(() => RecordingReader.Read(_files.Text(name, content)));
        Assert.StartsWith(expected, e.Message);
    }
}
