using System.CommandLine;
using System.Globalization;
using ExprModel.Core.Export;
using ExprModel.Core.Models;
using ExprModel.Core.Simulation;
using ExprModel.Core.Stochastic;

namespace ExprModel.Cli.Commands;

/// <summary>exprmodel noise: read-outs of channel noise (spontaneous rate, first-spike jitter, firing probability against amplitude).</summary>
public static class NoiseCommand
{
    public static Command Create(CliContext ctx)
    {
        var c = new Command("noise", "Channel-noise read-outs over seeded trials: spontaneous firing, first-spike jitter or firing probability; CSV.");
        var model = new Argument<string?>("model") { Description = "Model file (exprmodel JSON).", Arity = ArgumentArity.ZeroOrOne };
        var preset = new Option<string?>("--preset") { Description = "Use a published preset instead of a file." };
        var measure = new Option<string>("--measure") { Description = "spontaneous, jitter or probability.", DefaultValueFactory = _ => "spontaneous" };
        var amplitude = new Option<double>("--amplitude") { Description = "Step amplitude for jitter (uA/cm2).", DefaultValueFactory = _ => 10 };
        var amplitudes = new Option<string>("--amplitudes")
        {
            Description = "Pulse amplitudes for probability, comma-separated (uA/cm2).",
            DefaultValueFactory = _ => "0,2,4,6,8,10,12,14,16",
        };
        var pulse = new Option<double>("--pulse") { Description = "Pulse length for probability (ms).", DefaultValueFactory = _ => 1 };
        var duration = new Option<double>("--duration")
        {
            Description = "Run length for spontaneous firing, step length for jitter (ms).",
            DefaultValueFactory = _ => 1000,
        };
        var trials = new Option<int>("--trials") { Description = "Trials (seeds seed, seed + 1, ...).", DefaultValueFactory = _ => 20 };
        var seed = new Option<long>("--seed") { Description = "Random seed.", DefaultValueFactory = _ => 1 };
        var scale = new Option<double>("--conductance-scale")
        {
            Description = "Multiply every unitary conductance (fewer, larger channels above 1).",
            DefaultValueFactory = _ => 1,
        };
        var diffusionFrom = new Option<int>("--diffusion-from")
        {
            Description = "Channel types with at least this many channels take the diffusion approximation, fewer binomial tracking "
                + "(0 = tracking for every type).",
            DefaultValueFactory = _ => ChannelNoiseSettings.DefaultDiffusionFromChannels,
        };
        var out_ = new Option<string?>("--out") { Description = "Write to this file instead of standard output." };
        var db = new Option<string?>("--db") { Description = "Catalog database file." };
        c.Arguments.Add(model);
        foreach (var o in new Option[] { preset, measure, amplitude, amplitudes, pulse, duration, trials, seed, scale, diffusionFrom, out_, db })
            c.Options.Add(o);
        c.SetAction(p =>
        {
            ctx.DatabasePath = p.GetValue(db);
            var file = p.GetValue(model);
            var presetId = p.GetValue(preset);
            if ((file is null) == (presetId is null)) throw new CliException("Give either a model file or --preset ID (exactly one).");
            ModelDocument doc = presetId is not null ? ctx.Catalog.Preset(presetId)
                : File.Exists(file) ? ModelDocument.Parse(File.ReadAllText(file!), file!) : throw new CliException($"{file}: no such model file.");
            var cell = new CompiledCell(ctx.Catalog.BuildCell(doc));
            double f = p.GetValue(scale);
            if (!(f > 0) || double.IsInfinity(f)) throw new CliException($"--conductance-scale: must be positive (got {f}).");
            var settings = new ChannelNoiseSettings
            {
                UnitaryConductancesPs = ChannelNoise.UnitaryConductances(cell.Model, e => ctx.Catalog.UnitaryConductances.For(e).ConductancePs * f),
                Seed = p.GetValue(seed),
                RecordEvery = 0,
                DiffusionFromChannels = ModelCommands.DiffusionFrom(p.GetValue(diffusionFrom)),
            };
            int n = p.GetValue(trials);
            if (n < 1 || n > 100_000) throw new CliException($"--trials: must be 1 to 100000 (got {n}).");
            string note = $"channel noise ({settings.MethodSummary}), {n} trials from seed {settings.Seed}, unitary conductances x {f}";
            CsvTable table;
            switch (p.GetValue(measure))
            {
                case "spontaneous":
                    table = CsvTable.ForModel(doc.Name, ["duration_ms", "trials", "spontaneous_rate_hz"], note);
                    table.Row(p.GetValue(duration), n, NoiseReadouts.SpontaneousRateHz(cell, settings, p.GetValue(duration), n));
                    break;
                case "jitter":
                    var j = NoiseReadouts.Jitter(cell, settings, p.GetValue(amplitude), p.GetValue(duration), n);
                    table = CsvTable.ForModel(doc.Name, ["amplitude_ua_per_cm2", "trials", "trials_with_spike", "mean_latency_ms", "latency_sd_ms"], note);
                    table.Row(p.GetValue(amplitude), n, j.LatenciesMs.Count, j.MeanMs, j.StandardDeviationMs);
                    break;
                case "probability":
                    var amps = Amplitudes(p.GetValue(amplitudes)!);
                    table = CsvTable.ForModel(doc.Name, ["amplitude_ua_per_cm2", "trials", "fired", "probability"], note + $", {p.GetValue(pulse)} ms pulses");
                    foreach (var point in NoiseReadouts.FiringProbability(cell, settings, amps, p.GetValue(pulse), n))
                        table.Row(point.AmplitudeUaPerCm2, point.Trials, point.Fired, point.Probability);
                    break;
                case var other:
                    throw new CliException($"--measure: unknown read-out '{other}' (spontaneous, jitter, probability).");
            }
            ctx.Emit(table.ToString(), p.GetValue(out_));
            return 0;
        });
        return c;
    }

    private static double[] Amplitudes(string text) =>
        text.Split(',', StringSplitOptions.RemoveEmptyEntries | StringSplitOptions.TrimEntries).Select((s, i) =>
            double.TryParse(s, NumberStyles.Float, CultureInfo.InvariantCulture, out var x) && double.IsFinite(x) ? x
                : throw new CliException($"--amplitudes: item {i + 1} '{s}' is not a number.")).ToArray();
}
