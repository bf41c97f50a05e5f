using ExprModel.Core.Recordings;
using ExprModel.Core.Tests.Expression;

namespace ExprModel.Core.Tests.Recordings;

/// <summary>Files written by our writer per the NWB 2.x schema (nwb-schema core: nwb.base.yaml, nwb.icephys.yaml) read back equal.</summary>
public sealed class NwbWriterTests : IDisposable
{
    private readonly TempFiles _files = new();
    public void Dispose() => _files.Dispose();

    internal static NwbSession Session(params RecordedCell[] cells) => new() { Identifier = "test-session", Cells = cells };

    [Fact]
    public void WrittenFamily_ReadsBackEqual()
    {
        var cell = SyntheticSweeps.Family(0.02) with { CellId = "FH1001" };
        var path = Path.Combine(_files.Dir, "one.nwb");
        NwbWriter.Write(path, Session(cell));
        var back = Assert.Single(NwbReader.Read(path));
        Assert.Equal("FH1001", back.CellId);
        Assert.Equal(cell.Sweeps.Select(s => s.SweepNumber), back.Sweeps.Select(s => s.SweepNumber));
        foreach (var (a, b) in cell.Sweeps.Zip(back.Sweeps))
        {
            Assert.Equal(a.SampleIntervalMs, b.SampleIntervalMs, 12);
            // Stored as float32 mV and pA: equal to the float32 rounding of what was written.
            Assert.Equal(a.VoltageMv.Select(x => (double)(float)x), b.VoltageMv);
            Assert.Equal(a.CurrentPa.Select(x => (double)(float)x), b.CurrentPa);
            Assert.Equal(a.Step!.OnsetMs, b.Step!.OnsetMs, 9);
            Assert.Equal(a.Step.AmplitudePa, b.Step.AmplitudePa, 4);
            Assert.Contains("/acquisition/sweep_", b.Source);
        }
        Assert.Empty(back.Notes);
    }

    [Fact]
    public void TwoCellsInOneFile_AreSeparatedByElectrode_AndAnAbortedSweepKeepsItsCommand()
    {
        var a = SyntheticSweeps.Family(0.025) with { CellId = "A" };
        var b = SyntheticSweeps.Family(0.025) with { CellId = "B" };
        var s = b.Sweeps[5];
        var aborted = RecordedSweep.Create(s.SweepNumber, s.SampleIntervalMs, s.VoltageMv[..10000], s.CurrentPa, "x");
        b = b with { Sweeps = [.. b.Sweeps.Take(5), aborted] };
        var path = Path.Combine(_files.Dir, "two.nwb");
        NwbWriter.Write(path, Session(a, b));
        var cells = NwbReader.Read(path);
        Assert.Equal(["A", "B"], cells.Select(c => c.CellId));
        var back = cells[1].Sweeps[5];
        Assert.Equal(10000, back.VoltageMv.Length);
        Assert.Equal(s.CurrentPa.Length * 0.025, back.CommandDurationMs!.Value, 9);
    }

    [Fact]
    public void SameSession_GivesTheSameBytes()
    {
        var cell = SyntheticSweeps.Family(0.05);
        var p1 = Path.Combine(_files.Dir, "a.nwb");
        var p2 = Path.Combine(_files.Dir, "b.nwb");
        NwbWriter.Write(p1, Session(cell));
        NwbWriter.Write(p2, Session(cell));
        Assert.Equal(File.ReadAllBytes(p1), File.ReadAllBytes(p2));
    }
}
