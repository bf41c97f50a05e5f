using System.Globalization;
using System.Text;
using System.Text.Json;
using System.Text.Json.Nodes;
using ExprModel.Core.Analysis;
using ExprModel.Core.Expression;
using ExprModel.Core.Mapping;
using ExprModel.Core.Recordings;
using ExprModel.Core.Simulation;
using ExprModel.Data.Catalog;

namespace ExprModel.Data.Demo;

/// <summary>
/// Generates invented current-clamp recordings (NWB) for some cells of the demo survey. Each recorded cell is simulated
/// from its per-cell model built from expression, with every channel's density multiplied by a hidden factor drawn
/// log-normally (the cell as it "really" is, which the expression-built model does not know); then the recording
/// adds what real ones have: white noise, a baseline that wanders from sweep to sweep and drifts within one, a 20 kHz
/// sampling rate, 16-bit storage, and a few awkward sweeps (a missing sweep, an aborted one). The hidden factors go to a
/// sidecar file so later checks can ask whether a fit recovers them. Nothing here is measured.
/// </summary>
public static class DemoRecordingGenerator
{
    public const int DefaultSeed = 20261202;
    public const string DirectoryName = "recordings";
    public const string SidecarFileName = "hidden-factors.json";
    public const int CellsPerGroup = 3;
    /// <summary>Sampling: 20 kHz, a common current-clamp rate (common practice); the model runs at 25 us and every second step is kept.</summary>
    public const double SampleIntervalMs = 0.05;
    public const double BaselineMs = 50, StepMs = 400, TailMs = 50;
    /// <summary>The step family (pA): three hyperpolarising steps, then 40 to 400 pA by 40 pA.</summary>
    public static IReadOnlyList<double> StepsPa { get; } = [-90, -60, -30, .. Enumerable.Range(1, 10).Select(k => 40.0 * k)];
    /// <summary>Spread of the hidden per-channel factors: ln(factor) ~ N(0, 0.3^2), about +-35 % (our choice).</summary>
    public const double FactorLogSd = 0.3;
    /// <summary>
    /// Noise and drift (our choices, within what patch recordings show, from memory): rms 0.15 mV; baseline steps of sd
    /// 0.4 mV between sweeps; up to +-0.5 mV drift within a sweep.
    /// </summary>
    public const double NoiseMv = 0.15, SweepOffsetSdMv = 0.4, WithinSweepDriftMv = 0.5;
    /// <summary>16-bit storage step (mV): fine against the noise.</summary>
    public const double VoltageResolutionMv = 0.01;

    /// <summary>The generated files: name to bytes (NWB files and the sidecar).</summary>
    public static IReadOnlyDictionary<string, byte[]> Generate(ChannelCatalog catalog, string demoDirectory, int seed = DefaultSeed)
    {
        var data = ExpressionDataset.Read(catalog.ForMapping(), Path.Combine(demoDirectory, DemoDataGenerator.CountsFileName), new ExpressionReadOptions(),
            Path.Combine(demoDirectory, DemoDataGenerator.MetadataFileName), "group");
        var report = data.Map();
        var rng = new DemoDataGenerator.Draws(seed);
        var files = new SortedDictionary<string, byte[]>(StringComparer.Ordinal);
        var sidecar = new JsonArray();
        for (int g = 0; g < DemoDataGenerator.Groups.Count; g++)
            for (int k = 0; k < CellsPerGroup; k++)
            {
                string id = $"FH{g + 1}{k + 1:D3}";
                var built = data.Build(report, new DensityRule(), ModelTarget.ForCell(id));
                var factors = built.Document.Channels.Select(c => c.Entry).Distinct().ToDictionary(e => e, _ => Math.Exp(FactorLogSd * rng.Normal()));
                var doc = built.Document.WithRelativeDensities(factors);
                var cell = new CompiledCell(catalog.BuildCell(doc));
                // Awkward sweeps: the first cell of each group loses sweep 7; the second has its last sweep aborted 60 % into the step.
                int? missing = k == 0 ? 7 : null;
                int? aborted = k == 1 ? StepsPa.Count : null;
                var (sweeps, notes) = Record(cell, rng, missing, aborted, id);
                var session = new NwbSession
                {
                    Identifier = $"fernhollow-demo-{id}",
                    Description = $"Invented demo recording of cell {id} (group {DemoDataGenerator.Groups[g].Name}); simulated, not measured.",
                    Cells = [new RecordedCell { CellId = id, Source = id + ".nwb", Sweeps = sweeps }],
                    VoltageResolutionMv = VoltageResolutionMv,
                    Compress = true,
                };
                using var ms = new MemoryStream();
                NwbWriter.Build(session).Write(ms);
                files[id + ".nwb"] = ms.ToArray();
                var f = new JsonObject();
                foreach (var (entry, factor) in factors.OrderBy(p => p.Key, StringComparer.Ordinal)) f[entry] = Math.Round(factor, 6);
                sidecar.Add(new JsonObject
                {
                    ["cell"] = id,
                    ["group"] = DemoDataGenerator.Groups[g].Name,
                    ["file"] = id + ".nwb",
                    ["density_factors"] = f,
                    ["missing_sweep"] = missing,
                    ["aborted_sweep"] = aborted,
                    ["notes"] = new JsonArray(notes.Select(n => (JsonNode)JsonValue.Create(n)!).ToArray()),
                });
            }
        var root = new JsonObject
        {
            ["about"] = "Invented: hidden per-channel density factors (relative to the expression-built per-cell model) of the simulated demo recordings. " +
                "Not measured.",
            ["seed"] = seed,
            ["factor_log_sd"] = FactorLogSd,
            ["noise_mv"] = NoiseMv,
            ["sweep_offset_sd_mv"] = SweepOffsetSdMv,
            ["within_sweep_drift_mv"] = WithinSweepDriftMv,
            ["sample_interval_ms"] = SampleIntervalMs,
            ["steps_pa"] = new JsonArray(StepsPa.Select(a => (JsonNode)JsonValue.Create(a)!).ToArray()),
            ["cells"] = sidecar,
        };
        files[SidecarFileName] = Encoding.UTF8.GetBytes(root.ToJsonString(new JsonSerializerOptions { WriteIndented = true }) + "\n");
        return files;
    }

    /// <summary>Writes the files into catalog/demo/recordings (replacing what is there) and returns their paths.</summary>
    public static IReadOnlyList<string> WriteTo(ChannelCatalog catalog, string demoDirectory, int seed = DefaultSeed)
    {
        var dir = Path.Combine(demoDirectory, DirectoryName);
        Directory.CreateDirectory(dir);
        var paths = new List<string>();
        foreach (var (name, bytes) in Generate(catalog, demoDirectory, seed))
        {
            var path = Path.Combine(dir, name);
            File.WriteAllBytes(path, bytes);
            paths.Add(path);
        }
        return paths;
    }

    private static (List<RecordedSweep> Sweeps, List<string> Notes) Record(CompiledCell cell, DemoDataGenerator.Draws rng, int? missing,
        int? aborted, string id)
    {
        var sim = SimulationSettings.Default with { RecordEvery = (int)Math.Round(SampleIntervalMs / SimulationSettings.Default.DtMs) };
        var notes = new List<string>();
        var rest = Simulator.Run(cell, new NoCurrent(), 500, sim with { RecordEvery = 0 }).FinalState;
        var sweeps = new List<RecordedSweep>();
        double offset = 0;
        for (int n = 1; n <= StepsPa.Count; n++)
        {
            double pa = StepsPa[n - 1];
            offset += SweepOffsetSdMv * rng.Normal();
            double drift = WithinSweepDriftMv * (2 * rng.Uniform() - 1);
            var stim = Protocols.Step(cell.Model.Geometry.PicoampsToDensity(pa), BaselineMs, StepMs);
            Trace trace;
            try { trace = Simulator.Run(cell, stim, BaselineMs + StepMs + TailMs, sim, rest); }
            catch (SimulationBlowUpException e)
            {
                notes.Add($"{id}: the step of {pa} pA has no stable response in the model ({e.Message}); sweep {n} not recorded.");
                continue;
            }
            int samples = trace.VoltageMv.Length;
            var v = new double[samples];
            var command = new double[samples];
            for (int i = 0; i < samples; i++)
            {
                double t = i * SampleIntervalMs;
                v[i] = trace.VoltageMv[i] + offset + drift * t / (BaselineMs + StepMs + TailMs) + NoiseMv * rng.Normal();
                command[i] = t >= BaselineMs && t < BaselineMs + StepMs ? pa : 0;
            }
            if (n == missing) continue;
            int keep = n == aborted ? (int)((BaselineMs + 0.6 * StepMs) / SampleIntervalMs) : samples;
            sweeps.Add(RecordedSweep.Create(n, SampleIntervalMs, v[..keep], command, string.Create(CultureInfo.InvariantCulture, $"{id}, sweep {n}")));
        }
        return (sweeps, notes);
    }
}
