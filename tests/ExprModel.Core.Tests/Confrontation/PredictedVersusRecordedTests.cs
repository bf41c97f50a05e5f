using ExprModel.Core.Analysis;
using ExprModel.Core.Confrontation;
using ExprModel.Core.Tests.Expression;

namespace ExprModel.Core.Tests.Confrontation;

public sealed class PredictedVersusRecordedTests : IDisposable
{
    private readonly TempFiles _files = new();
    public void Dispose() => _files.Dispose();

    // Group A: four recorded cells; group B: two.
    private const string Recorded = "cell,resting potential (mV),rheobase (nA)\na1,-70,0.10\na2,-66,0.12\na3,-68,0.08\na4,-72,\nb1,-60,0.05\nb2,-62,0.04\n";
    private static readonly Dictionary<string, string> Group = new() { ["a1"] = "A", ["a2"] = "A", ["a3"] = "A", ["a4"] = "A", ["b1"] = "B", ["b2"] = "B" };

    private RecordedFeatures Features() => ReadoutMatcher.Match(RecordedFeatureReader.Read(_files.Text("rec.csv", Recorded)), _ => true);

    private static CellPrediction Predict(string cell, double restMv, double? rheobasePa) =>
        new(cell, new CellReadouts { RestingPotentialMv = restMv, RheobasePa = rheobasePa, AreaUm2 = 5000 }, "");

    [Fact]
    public void DifferencesAndZScoresAgainstTheGroupsRecordedSpread()
    {
        var predictions = new Dictionary<string, CellPrediction>
        {
            ["a1"] = Predict("a1", -69, 90),
            ["a2"] = Predict("a2", -65, 100),
            ["a3"] = Predict("a3", -70, 95),
            ["a4"] = Predict("a4", -71, 120),
            ["b1"] = Predict("b1", -58, 60),
            ["b2"] = Predict("b2", -63, null),
        };
        var r = PredictedVersusRecorded.Compare(Features(), predictions, c => Group[c], ModelPer.Cell);

        double sdA = Math.Sqrt(new[] { -70.0, -66, -68, -72 }.Select(x => (x + 69) * (x + 69)).Sum() / 3); // mean -69, sample SD
        var a1 = r.Cells.Single(c => c.CellId == "a1" && c.Readout == "resting_potential");
        Assert.Equal(1, a1.Difference!.Value, 12);
        Assert.Equal(1 / sdA, a1.ZScore!.Value, 12);
        // Rheobase recorded in nA, compared in the read-out's pA.
        var a1r = r.Cells.Single(c => c.CellId == "a1" && c.Readout == "rheobase_absolute");
        Assert.Equal(100, a1r.Recorded!.Value, 9);
        Assert.Equal(-10, a1r.Difference!.Value, 9);
        // Group B has two recorded cells: no z-score, and the note says why.
        var b1 = r.Cells.Single(c => c.CellId == "b1" && c.Readout == "resting_potential");
        Assert.Null(b1.ZScore);
        Assert.Contains("fewer than 3", b1.Note);
        // b2 has a recording but its model gives no rheobase.
        var b2 = r.Cells.Single(c => c.CellId == "b2" && c.Readout == "rheobase_absolute");
        Assert.Null(b2.Predicted);
        Assert.Contains("no rheobase_absolute", b2.Note);

        var groupA = r.Groups.Single(g => g.Group == "A" && g.Readout == "resting_potential");
        Assert.Equal(4, groupA.RecordedCells);
        Assert.Equal(-69, groupA.RecordedMean!.Value, 12);
        Assert.Equal(sdA, groupA.RecordedSd!.Value, 12);
        Assert.Equal(-68.75 + 69, groupA.Difference!.Value, 12);
        Assert.Equal(0.25 / sdA, groupA.ZScore!.Value, 12);

        var rest = r.Agreement.Single(a => a.Readout == "resting_potential");
        Assert.Equal(6, rest.Cells);
        var rheobase = r.Agreement.Single(a => a.Readout == "rheobase_absolute");
        Assert.Equal(4, rheobase.Cells); // a4 has no recording, b2 no prediction
    }

    [Fact]
    public void AMissingOrFailedModelIsNamedNotDropped()
    {
        var predictions = new Dictionary<string, CellPrediction> { ["a1"] = new("a1", null, "failed: Cell 'a1' is not in x.csv.") };
        var r = PredictedVersusRecorded.Compare(Features(), predictions, c => Group[c], ModelPer.Cell);
        Assert.Contains("failed", r.Cells.Single(c => c.CellId == "a1" && c.Readout == "resting_potential").Note);
        Assert.Equal("not predicted.", r.Cells.Single(c => c.CellId == "a2" && c.Readout == "resting_potential").Note);
        Assert.All(r.Agreement, a => Assert.Equal(0, a.Cells));
    }
}
