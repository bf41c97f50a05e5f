using ExprModel.Core.Analysis;
using ExprModel.Core.Confrontation;
using ExprModel.Core.Recordings;
using ExprModel.Core.Tests.Expression;
using ExprModel.Core.Tests.Recordings;

namespace ExprModel.Core.Tests.Confrontation;

public sealed class RecordedSweepFeaturesTests : IDisposable
{
    private readonly TempFiles _files = new();
    public void Dispose() => _files.Dispose();

    // The analytic family of SyntheticSweeps: R = 200 MOhm, rheobase 40 pA (textbook RC identity, triangular spikes).
    private static RecordedReadouts Synthetic(string id) =>
        RecordingFeatures.Measure(SyntheticSweeps.Family(0.02) with { CellId = id, Source = id + ".nwb" });

    [Fact]
    public void Sweeps_give_the_simulators_readouts_with_their_file_as_source()
    {
        var f = RecordedSweepFeatures.From([Synthetic("c1")], "recordings", _ => true);
        var rin = f.Readouts.Single(r => r.Readout == "input_resistance");
        Assert.Equal(200, rin.ValueByCell["c1"], 6);
        Assert.Equal("sweeps c1.nwb", rin.SourceByCell!["c1"]);
        Assert.Equal(40, f.Readouts.Single(r => r.Readout == "rheobase_absolute").ValueByCell["c1"], 9);
        // Current densities need an area a recording does not have; latency is read on a step above rheobase: neither is compared.
        Assert.DoesNotContain(f.Readouts, r => r.Readout is "rheobase" or "first_spike_latency");
        Assert.Contains(f.Matches, m => m.Header.StartsWith("first_spike_latency") && !m.Matched);
        Assert.Equal(["c1"], f.RecordedCells);
    }

    [Fact]
    public void A_recorded_cell_missing_from_the_expression_table_is_an_error_naming_its_file()
    {
        var e = Assert.Throws<RecordingFormatException>(() => RecordedSweepFeatures.From([Synthetic("zz9")], "recordings", c => c != "zz9"));
        Assert.Contains("zz9.nwb", e.Message);
        Assert.Contains("not in the expression table", e.Message);
    }

    [Fact]
    public void Joined_with_a_table_the_sweeps_win_and_the_tables_value_is_noted()
    {
        // Table in GOhm (1 GOhm = 1000 MOhm): c1 also has sweeps (200 MOhm), c2 only the table.
        var table = ReadoutMatcher.Match(RecordedFeatureReader.Read(_files.Text("rec.csv", "cell,input resistance (GOhm)\nc1,0.35\nc2,0.25\n")), _ => true);
        var joined = RecordedSweepFeatures.Join(RecordedSweepFeatures.From([Synthetic("c1")], "recordings", _ => true), table);
        var rin = joined.Readouts.Single(r => r.Readout == "input_resistance");
        Assert.Equal(200, rin.ValueByCell["c1"], 6);
        Assert.Equal(250, rin.InReadoutUnit(rin.ValueByCell["c2"], null), 9);
        Assert.Equal("sweeps c1.nwb", rin.SourceByCell!["c1"]);
        Assert.Equal("table rec.csv, column 'input resistance (GOhm)'", rin.SourceByCell["c2"]);
        Assert.Contains("gives 350 MOhm", rin.NoteByCell!["c1"]);
        Assert.Equal(["c1", "c2"], joined.RecordedCells);

        // The comparison names each row's source.
        var predictions = new Dictionary<string, CellPrediction>
        {
            ["c1"] = new("c1", new CellReadouts { InputResistanceMOhm = 180, AreaUm2 = 5000 }, ""),
            ["c2"] = new("c2", new CellReadouts { InputResistanceMOhm = 240, AreaUm2 = 5000 }, ""),
        };
        var r = PredictedVersusRecorded.Compare(joined, predictions, _ => null, ModelPer.Cell);
        var c1 = r.Cells.Single(c => c.CellId == "c1" && c.Readout == "input_resistance");
        Assert.Equal(-20, c1.Difference!.Value, 6);
        Assert.Equal("sweeps c1.nwb", c1.RecordedSource);
        Assert.Contains("the sweeps' 200 is used", c1.Note);
        var c2 = r.Cells.Single(c => c.CellId == "c2" && c.Readout == "input_resistance");
        Assert.Equal(-10, c2.Difference!.Value, 9);
        Assert.StartsWith("recorded: table rec.csv", c2.Note);
    }
}
