using ExprModel.Core.Recordings;
using ExprModel.Core.Tests.Expression;
using PureHDF;

namespace ExprModel.Core.Tests.Recordings;

/// <summary>
/// Bad recordings: each gives a <see cref="RecordingFormatException"/> naming the file and the dataset path, never a
/// crash or a hang. Files start from our writer's output (schema names: nwb-schema core) and are then broken.
/// </summary>
public sealed class NwbReaderTests : IDisposable
{
    private readonly TempFiles _files = new();
    public void Dispose() => _files.Dispose();

    private static H5Group At(H5Group root, string path)
    {
        var g = root;
        foreach (var part in path.Split('/', StringSplitOptions.RemoveEmptyEntries)) g = (H5Group)g[part];
        return g;
    }

    private static H5Dataset Data(H5File f, string series) => (H5Dataset)At(f, series)["data"];
    private static H5Dataset Start(H5File f, string series) => (H5Dataset)At(f, series)["starting_time"];

    private const string R1 = "/acquisition/sweep_001", R2 = "/acquisition/sweep_002";
    private const string S1 = "/stimulus/presentation/sweep_001", S2 = "/stimulus/presentation/sweep_002";

    private static float[] Floats(RecordedSweep s) => s.VoltageMv.Select(x => (float)x).ToArray();

    /// <summary>Name, how to break the file, and what the error must name (dataset path) and say.</summary>
    public static TheoryData<string, Action<H5File>, string, string> Cases() => new()
    {
        { "missing_rate", f => Start(f, R1).Attributes!.Remove("rate"), "dataset /acquisition/sweep_001/starting_time", "'rate' missing" },
        { "wrong_unit", f => Data(f, R1).Attributes!["unit"] = "amperes", "dataset /acquisition/sweep_001/data", "not a voltage unit" },
        { "unit_missing", f => Data(f, R2).Attributes!.Remove("unit"), "dataset /acquisition/sweep_002/data", "'unit' missing" },
        { "no_stimulus", f => At(f, "/stimulus/presentation").Remove("sweep_002"), "dataset /acquisition/sweep_002", "has no stimulus" },
        { "nan_run", f => At(f, R1)["data"] = NanRun(f), "dataset /acquisition/sweep_001/data", "samples 100 to 119 are NaN (a run of 20)" },
        { "one_hz", f => Start(f, R2).Attributes!["rate"] = 1f, "dataset /acquisition/sweep_002/starting_time", "sampling rate 1 Hz" },
        { "unknown_type", f => At(f, R1).Attributes!["neurodata_type"] = "MysterySeries", "dataset /acquisition/sweep_001",
            "unknown series type 'MysterySeries'" },
        { "claims_2gb", f => At(f, R1)["data"] = Huge(), "dataset /acquisition/sweep_001/data", "claims 500,000,000 samples (2 GB)" },
        { "mismatched_lengths", f => At(f, S2)["data"] = new H5Dataset(new float[100]) { Attributes = new() { ["unit"] = "amperes", ["conversion"] = 1e-12f } },
            "dataset /acquisition/sweep_002/data", "mismatched lengths" },
        { "no_sweep_number", f => At(f, R1).Attributes!.Remove("sweep_number"), "dataset /acquisition/sweep_001", "no sweep_number" },
        { "no_data", f => At(f, R2).Remove("data"), "dataset /acquisition/sweep_002/data", "missing" },
        { "conversion_zero", f => Data(f, R1).Attributes!["conversion"] = 0f, "dataset /acquisition/sweep_001/data", "'conversion' is 0" },
        { "two_dimensional", f => At(f, R1)["data"] = new H5Dataset(new float[3, 4]) { Attributes = new() { ["unit"] = "volts" } },
            "dataset /acquisition/sweep_001/data", "has shape [3, 4]" },
        { "duplicate_sweep_number", f => At(f, R2).Attributes!["sweep_number"] = 1u, "dataset /acquisition/sweep_002", "also used by /acquisition/sweep_001" },
        { "stimulus_rate_differs", f => Start(f, S1).Attributes!["rate"] = 20000f, "dataset /acquisition/sweep_001", "but its stimulus" },
        { "nwb_version_1", f => f.Attributes!["nwb_version"] = "1.0.6", "dataset /", "only NWB 2.x" },
        { "not_nwb", f => f.Attributes!.Remove("neurodata_type"), "dataset /", "not an NWB file" },
        { "no_acquisition", f => f.Remove("acquisition"), "dataset /acquisition", "missing" },
        { "no_timing", f => At(f, R1).Remove("starting_time"), "dataset /acquisition/sweep_001", "sampling rate is unknown" },
        { "uneven_timestamps", f => { At(f, R1).Remove("starting_time"); At(f, R1)["timestamps"] = Uneven(); },
            "dataset /acquisition/sweep_001/timestamps", "not evenly spaced" },
    };

    private static H5Dataset NanRun(H5File f)
    {
        var v = new float[5000];
        for (int i = 100; i < 120; i++) v[i] = float.NaN;
        return new H5Dataset(v) { Attributes = new() { ["unit"] = "volts", ["conversion"] = 1e-3f } };
    }

    /// <summary>A chunked dataset declaring 500 million float32 samples with no chunk written: a small file claiming 2 GB.</summary>
    private static H5Dataset Huge() => new H5Dataset<float[]>(fileDims: [500_000_000UL], chunks: [1_000_000]) { Attributes = new() { ["unit"] = "volts" } };

    private static H5Dataset Uneven()
    {
        var t = Enumerable.Range(0, 35000).Select(i => i / 50000.0).ToArray();
        t[1000] += 1e-5;
        return new H5Dataset(t);
    }

    [Theory]
    [MemberData(nameof(Cases))]
    public void BrokenFile_GivesAnErrorNamingFileAndDataset(string name, Action<H5File> breakIt, string where, string what)
    {
        var file = NwbWriter.Build(NwbWriterTests.Session(SyntheticSweeps.Family(0.02) with { CellId = "c1" }));
        breakIt(file);
        var path = Path.Combine(_files.Dir, name + ".nwb");
        file.Write(path);
        var e = Assert.Throws<RecordingFormatException>(() => NwbReader.Read(path));
        Assert.StartsWith($"{name}.nwb: {where}:", e.Message);
        Assert.Contains(what, e.Message);
    }

    [Fact]
    public void EmptyFile_NotHdf5_Truncated_AndMissing_AreNamed()
    {
        var empty = _files.Bytes("empty.nwb", []);
        Assert.Equal("empty.nwb: byte 0: the file is empty.", Assert.Throws<RecordingFormatException>(() => NwbReader.Read(empty)).Message);
        var text = _files.Text("text.nwb", "time,V\n0,1\n");
        Assert.Contains("text.nwb: byte 0: not an HDF5 file", Assert.Throws<RecordingFormatException>(() => NwbReader.Read(text)).Message);
        Assert.Contains("nowhere.nwb: file not found",
            Assert.Throws<RecordingFormatException>(() => NwbReader.Read(Path.Combine(_files.Dir, "nowhere.nwb"))).Message);

        // Truncated: the file is cut part-way through (a copy that stopped early); the error names the file and a dataset.
        var whole = Path.Combine(_files.Dir, "whole.nwb");
        NwbWriter.Write(whole, NwbWriterTests.Session(SyntheticSweeps.Family(0.02)));
        var bytes = File.ReadAllBytes(whole);
        foreach (double keep in new[] { 0.3, 0.6, 0.9 })
        {
            var cut = _files.Bytes($"cut{keep}.nwb", bytes[..(int)(bytes.Length * keep)]);
            var e = Assert.Throws<RecordingFormatException>(() => NwbReader.Read(cut));
            Assert.StartsWith($"cut{keep}.nwb: dataset /", e.Message);
        }
    }

    [Fact]
    public void OtherSeriesTypes_AreSkippedWithANote()
    {
        var file = NwbWriter.Build(NwbWriterTests.Session(SyntheticSweeps.Family(0.02)));
        ((H5Group)file["acquisition"])["vclamp"] = new H5Group { Attributes = new() { ["neurodata_type"] = "VoltageClampSeries", ["namespace"] = "core" } };
        var path = Path.Combine(_files.Dir, "mixed.nwb");
        file.Write(path);
        var cell = Assert.Single(NwbReader.Read(path));
        Assert.Contains(cell.Notes, n => n.Contains("/acquisition/vclamp: VoltageClampSeries skipped"));
        Assert.Equal(6, cell.Sweeps.Count);
    }
}
