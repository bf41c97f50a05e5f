using ExprModel.Core.Recordings;
using ExprModel.Data.Catalog;
using ExprModel.Data.Demo;
using ExprModel.Data.Tests.Catalog;

namespace ExprModel.Data.Tests.Demo;

/// <summary>
/// The committed demo recordings (catalog/demo/recordings) are exactly what the seeded generator makes. Set
/// EXPRMODEL_WRITE_DEMO=1 to rewrite them (then commit the result).
/// </summary>
public sealed class DemoRecordingGeneratorTests
{
    private static readonly Lazy<ChannelCatalog> Catalog = new(() =>
        CatalogLocator.Ensure(Path.Combine(Path.GetTempPath(), $"exprmodel-demo-recordings-{Environment.ProcessId}.db"), CatalogFiles.Sources()));

    private static string DemoDir => Path.Combine(CatalogFiles.Directory, "demo");
    private static string RecordingsDir => Path.Combine(DemoDir, DemoRecordingGenerator.DirectoryName);

    [Fact]
    public void CommittedFiles_AreExactlyWhatTheSeededGeneratorMakes()
    {
        if (Environment.GetEnvironmentVariable("EXPRMODEL_WRITE_DEMO") == "1") DemoRecordingGenerator.WriteTo(Catalog.Value, DemoDir);
        var fresh = DemoRecordingGenerator.Generate(Catalog.Value, DemoDir);
        Assert.Equal(fresh.Keys.Order(StringComparer.Ordinal), Directory.GetFiles(RecordingsDir).Select(Path.GetFileName).Order(StringComparer.Ordinal));
        foreach (var (name, bytes) in fresh) Assert.True(bytes.AsSpan().SequenceEqual(File.ReadAllBytes(Path.Combine(RecordingsDir, name))),
            $"{name} differs from the generator's output");
        // Modest size: a few MB for all recordings.
        Assert.True(fresh.Values.Sum(b => (long)b.Length) < 5_000_000);
    }

    [Fact]
    public void Recordings_ReadBackWithTheirAwkwardSweepsNamed()
    {
        var cells = RecordingReader.Read(RecordingsDir);
        Assert.Equal(DemoDataGenerator.Groups.Count * DemoRecordingGenerator.CellsPerGroup, cells.Count);
        Assert.Contains("FH1001", cells.Select(c => c.CellId));
        var first = cells.Single(c => c.CellId == "FH1001");
        Assert.Contains(first.Notes, n => n.Contains("Sweep 7 is missing"));
        var second = RecordingFeatures.Measure(cells.Single(c => c.CellId == "FH1002"));
        Assert.Contains(second.Readouts.Notes, n => n.Contains("aborted"));
        foreach (var c in cells)
        {
            var r = RecordingFeatures.Measure(c);
            Assert.True(r.SmoothingMs > 0, $"{c.CellId}: noisy recordings are smoothed");
            // Some hidden-factor models rest depolarised (FH4001 near -24 mV); every rest lies between E_K and 0 mV.
            if (!r.Readouts.FiresAtRest) Assert.InRange(r.Readouts.RestingPotentialMv!.Value, -100, 0);
        }
    }
}
