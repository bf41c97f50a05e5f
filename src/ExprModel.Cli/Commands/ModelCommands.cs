using System.CommandLine;
using System.Globalization;
using System.Text.Json;
using System.Text.Json.Nodes;
using ExprModel.Core.Analysis;
using ExprModel.Core.Cell;
using ExprModel.Core.Export;
using ExprModel.Core.Models;
using ExprModel.Core.Simulation;

namespace ExprModel.Cli.Commands;

/// <summary>exprmodel simulate | fi | features | clamp-steps | mechanisms | methods, each on a model file or --preset ID.</summary>
public static class ModelCommands
{
    private sealed class Common
    {
        public readonly Argument<string?> Model = new("model") { Description = "Model file (exprmodel JSON).", Arity = ArgumentArity.ZeroOrOne };
        public readonly Option<string?> Preset =
            new("--preset") { Description = "Use a published preset instead of a file (hh1952, wb1996, cortex-rs2008, cortex-fs2008)." };
        public readonly Option<string> Units =
            new("--units") { Description = "Current units for input and output: density (uA/cm2), pA or nA.", DefaultValueFactory = _ => "density" };
        public readonly Option<string?> Out = new("--out") { Description = "Write to this file instead of standard output." };
        public readonly Option<double> Dt = new("--dt") { Description = "Integration step (ms).", DefaultValueFactory = _ => 0.025 };
        public readonly Option<string?> Db = new("--db") { Description = "Catalog database file." };

        public void AddTo(Command c)
        {
            c.Arguments.Add(Model);
            c.Options.Add(Preset);
            c.Options.Add(Units);
            c.Options.Add(Out);
            c.Options.Add(Dt);
            c.Options.Add(Db);
        }

        public (ModelDocument Doc, CompiledCell Cell, CurrentUnit Unit) Load(ParseResult p, CliContext ctx)
        {
            ctx.DatabasePath = p.GetValue(Db);
            var file = p.GetValue(Model);
            var preset = p.GetValue(Preset);
            if ((file is null) == (preset is null)) throw new CliException("Give either a model file or --preset ID (exactly one).");
            ModelDocument doc;
            if (preset is not null) doc = ctx.Catalog.Preset(preset);
            else
            {
                if (!File.Exists(file)) throw new CliException($"{file}: no such model file.");
                doc = ModelDocument.Parse(File.ReadAllText(file!), file!);
            }
            var unit = CurrentUnits.Parse(p.GetValue(Units)!);
            return (doc, new CompiledCell(ctx.Catalog.BuildCell(doc)), unit);
        }
    }

    public static IEnumerable<Command> Create(CliContext ctx)
    {
        yield return Simulate(ctx);
        yield return Fi(ctx);
        yield return FeaturesCommand(ctx);
        yield return ClampSteps(ctx);
        yield return Mechanisms(ctx);
        yield return Methods(ctx);
    }

    internal static readonly JsonSerializerOptions Json =
        new() { WriteIndented = true, Encoder = System.Text.Encodings.Web.JavaScriptEncoder.UnsafeRelaxedJsonEscaping };

    private static Command Simulate(CliContext ctx)
    {
        var c = new Command("simulate", "Current-clamp simulation; writes the trace as CSV.");
        var common = new Common();
        common.AddTo(c);
        var protocol = new Option<string>("--protocol") { Description = "step, ramp, pulses, noise or waveform.", DefaultValueFactory = _ => "step" };
        var amp =
            new Option<double>("--amplitude") { Description = "Step/pulse amplitude, ramp end, or noise mean (in --units).", DefaultValueFactory = _ => 0 };
        var from = new Option<double>("--from") { Description = "Ramp start (in --units).", DefaultValueFactory = _ => 0 };
        var delay = new Option<double>("--delay") { Description = "Protocol start (ms).", DefaultValueFactory = _ => 100 };
        var duration = new Option<double>("--duration") { Description = "Protocol length (ms).", DefaultValueFactory = _ => 1000 };
        var total = new Option<double?>("--total") { Description = "Simulated time (ms); default delay + duration + 100." };
        var count = new Option<int>("--count") { Description = "Pulses in a train.", DefaultValueFactory = _ => 10 };
        var width = new Option<double>("--width") { Description = "Pulse width (ms).", DefaultValueFactory = _ => 2 };
        var freq = new Option<double>("--frequency") { Description = "Pulse frequency (Hz).", DefaultValueFactory = _ => 20 };
        var sd = new Option<double>("--sd") { Description = "Noise standard deviation (in --units).", DefaultValueFactory = _ => 0 };
        var tau = new Option<double>("--tau") { Description = "Noise correlation time (ms).", DefaultValueFactory = _ => 5 };
        var seed = new Option<int>("--seed") { Description = "Noise seed.", DefaultValueFactory = _ => 1 };
        var wave = new Option<string?>("--waveform") { Description = "CSV with columns time_ms and current (in --units) for --protocol waveform." };
        var every = new Option<int>("--record-every") { Description = "Keep every Nth step in the output.", DefaultValueFactory = _ => 4 };
        var currents = new Option<bool>("--currents") { Description = "Add each channel's current (uA/cm2)." };
        var channelNoise = new Option<bool>("--channel-noise")
        {
            Description = "Stochastic channels: counts from density x area / the catalog's unitary conductance, seeded by --seed.",
        };
        var diffusionFrom = new Option<int>("--diffusion-from")
        {
            Description = "With --channel-noise: channel types with at least this many channels take the diffusion approximation, "
                + "fewer binomial tracking (0 = tracking for every type).",
            DefaultValueFactory = _ => ExprModel.Core.Stochastic.ChannelNoiseSettings.DefaultDiffusionFromChannels,
        };
        foreach (var o in new Option[] { protocol, amp, from, delay, duration, total, count, width, freq, sd, tau, seed, wave, every, currents, channelNoise,
            diffusionFrom })
            c.Options.Add(o);
        c.SetAction(p =>
        {
            var (doc, cell, unit) = common.Load(p, ctx);
            var g = cell.Model.Geometry;
            double D(double x) => CurrentUnits.ToDensity(x, unit, g);
            double dl = p.GetValue(delay), du = p.GetValue(duration);
            Stimulus stim = p.GetValue(protocol) switch
            {
                "step" => Protocols.Step(D(p.GetValue(amp)), dl, du),
                "ramp" => Protocols.Ramp(D(p.GetValue(from)), D(p.GetValue(amp)), du, dl),
                "pulses" => Protocols.Pulses(D(p.GetValue(amp)), p.GetValue(count), p.GetValue(width), p.GetValue(freq), dl),
                "noise" => Protocols.Noise(D(p.GetValue(amp)), Math.Abs(D(p.GetValue(sd))), p.GetValue(tau), du, p.GetValue(seed), dl),
                "waveform" => ReadWaveform(p.GetValue(wave) ?? throw new CliException("--protocol waveform needs --waveform FILE."), unit, g),
                var other => throw new CliException($"--protocol: unknown protocol '{other}' (step, ramp, pulses, noise, waveform)."),
            };
            double t = p.GetValue(total) ?? dl + du + 100;
            bool withCurrents = p.GetValue(currents);
            if (p.GetValue(channelNoise))
            {
                if (withCurrents) throw new CliException("--currents is not available with --channel-noise.");
                var noise = new ExprModel.Core.Stochastic.ChannelNoiseSettings
                {
                    UnitaryConductancesPs = ExprModel.Core.Stochastic.ChannelNoise.UnitaryConductances(cell.Model,
                        e => ctx.Catalog.UnitaryConductances.For(e).ConductancePs),
                    Seed = p.GetValue(seed),
                    DtMs = p.GetValue(common.Dt),
                    RecordEvery = Math.Max(1, p.GetValue(every)),
                    DiffusionFromChannels = DiffusionFrom(p.GetValue(diffusionFrom)),
                };
                var noisy = ExprModel.Core.Stochastic.ChannelNoise.Run(cell, stim, t, noise);
                ctx.Emit(NoisyTraceCsv.Write(doc.Name, cell.Model, noisy, noise), p.GetValue(common.Out));
                return 0;
            }
            var trace = Simulator.Run(cell, stim, t,
                new SimulationSettings { DtMs = p.GetValue(common.Dt), RecordEvery = Math.Max(1, p.GetValue(every)), RecordCurrents = withCurrents });
            ctx.Emit(TraceCsv.Write(doc.Name, trace, unit, g), p.GetValue(common.Out));
            return 0;
        });
        return c;
    }

    /// <summary>--diffusion-from: 0 means binomial tracking for every type; negative values are refused.</summary>
    internal static int DiffusionFrom(int value) => value switch
    {
        0 => int.MaxValue,
        < 0 => throw new CliException($"--diffusion-from: must be 0 (tracking for every type) or a channel count (got {value})."),
        _ => value,
    };

    private static WaveformCurrent ReadWaveform(string path, CurrentUnit unit, Geometry g)
    {
        if (!File.Exists(path)) throw new CliException($"{path}: no such waveform file.");
        try
        {
            return WaveformReader.Read(File.ReadAllText(path), path, v => CurrentUnits.ToDensity(v, unit, g));
        }
        catch (WaveformFormatException e)
        {
            throw new CliException(e.Message);
        }
    }

    private static Command Fi(CliContext ctx)
    {
        var c = new Command("fi", "f-I curve: one row per step amplitude.");
        var common = new Common();
        common.AddTo(c);
        var from = new Option<double>("--from") { Description = "First step amplitude (in --units).", DefaultValueFactory = _ => 0 };
        var to = new Option<double>("--to") { Description = "Last step amplitude (in --units).", Required = true };
        var steps = new Option<int>("--steps") { Description = "Number of steps.", DefaultValueFactory = _ => 16 };
        var duration = new Option<double>("--duration") { Description = "Step length (ms).", DefaultValueFactory = _ => 1000 };
        var format = new Option<string>("--format") { Description = "csv or json.", DefaultValueFactory = _ => "csv" };
        foreach (var o in new Option[] { from, to, steps, duration, format }) c.Options.Add(o);
        c.SetAction(p =>
        {
            var (doc, cell, unit) = common.Load(p, ctx);
            var g = cell.Model.Geometry;
            int n = p.GetValue(steps);
            if (n < 1 || n > 10000) throw new CliException("--steps must be 1 to 10000.");
            double a = CurrentUnits.ToDensity(p.GetValue(from), unit, g), b = CurrentUnits.ToDensity(p.GetValue(to), unit, g);
            var curve = FiCurve.Measure(cell, a, b, n, p.GetValue(duration), null, new SimulationSettings { DtMs = p.GetValue(common.Dt) });
            string col = "amplitude_" + CurrentUnits.Suffix(unit);
            if (p.GetValue(format) == "json")
            {
                var arr = new JsonArray(curve.Select(q => (JsonNode)new JsonObject
                {
                    [col] = CurrentUnits.FromDensity(q.CurrentUaPerCm2, unit, g),
                    ["spike_count"] = q.SpikesInStep,
                    ["whole_step_rate_hz"] = q.WholeStepRateHz,
                    ["first_isi_rate_hz"] = q.FirstIsiRateHz,
                    ["late_rate_hz"] = q.LateRateHz,
                    ["first_spike_latency_ms"] = q.FirstSpikeLatencyMs,
                }).ToArray());
                var o = new JsonObject { ["caution"] = ResearchCaution.Text, ["model"] = doc.Name, ["units"] = CurrentUnits.Label(unit), ["fi"] = arr };
                ctx.Emit(o.ToJsonString(Json) + "\n", p.GetValue(common.Out));
                return 0;
            }
            if (p.GetValue(format) != "csv") throw new CliException("--format must be csv or json.");
            ctx.Emit(FiCsv.Write(doc.Name, curve, unit, g), p.GetValue(common.Out));
            return 0;
        });
        return c;
    }

    private static Command FeaturesCommand(CliContext ctx)
    {
        var c = new Command("features", "All electrophysiology read-outs as JSON.");
        var common = new Common();
        common.AddTo(c);
        c.SetAction(p =>
        {
            var (doc, cell, unit) = common.Load(p, ctx);
            var r = Features.Measure(cell, ReadoutSettings.Default with { Simulation = new SimulationSettings { DtMs = p.GetValue(common.Dt) } });
            ctx.Emit(ReadoutJson.Write(doc, cell, r, unit).ToJsonString(Json) + "\n", p.GetValue(common.Out));
            return 0;
        });
        return c;
    }

    private static Command ClampSteps(CliContext ctx)
    {
        var c = new Command("clamp-steps",
            "Voltage-clamp step family: I-V (peak and steady current per channel) and activation (normalised peak conductance).");
        var common = new Common();
        common.AddTo(c);
        var holding = new Option<double>("--holding") { Description = "Holding potential (mV).", DefaultValueFactory = _ => -80 };
        var from = new Option<double>("--from") { Description = "First command (mV).", DefaultValueFactory = _ => -100 };
        var to = new Option<double>("--to") { Description = "Last command (mV).", DefaultValueFactory = _ => 40 };
        var step = new Option<double>("--step") { Description = "Command increment (mV).", DefaultValueFactory = _ => 10 };
        var length = new Option<double>("--length") { Description = "Command length (ms).", DefaultValueFactory = _ => 100 };
        foreach (var o in new Option[] { holding, from, to, step, length }) c.Options.Add(o);
        c.SetAction(p =>
        {
            var (doc, cell, unit) = common.Load(p, ctx);
            double a = p.GetValue(from), b = p.GetValue(to), s = p.GetValue(step);
            if (!(s > 0) || b < a) throw new CliException("--step must be positive and --to >= --from.");
            var commands = new List<double>();
            for (double v = a; v <= b + 1e-9; v += s) commands.Add(Math.Round(v, 9));
            if (commands.Count > 1000) throw new CliException("Too many commands (over 1000).");
            var family = VoltageClamp.StepFamily(cell, p.GetValue(holding), commands, 50, p.GetValue(length), p.GetValue(common.Dt));
            var g = cell.Model.Geometry;
            ctx.Emit(ClampCsv.Write(doc.Name, ClampCurves.From(family), unit, g), p.GetValue(common.Out));
            return 0;
        });
        return c;
    }

    private static Command Mechanisms(CliContext ctx)
    {
        var c = new Command("mechanisms",
            "Adaptation mechanisms on a suprathreshold step train: threshold and after-hyperpolarisation per spike, each channel's " +
            "inter-spike current, and the pulse threshold after one spike and after the train against rest.");
        var common = new Common();
        common.AddTo(c);
        var amp = new Option<double?>("--amplitude") { Description = "Step amplitude (in --units); default twice the rheobase." };
        var duration = new Option<double>("--duration") { Description = "Step length (ms).", DefaultValueFactory = _ => 1000 };
        var delay = new Option<double>("--probe-delay") { Description = "Test pulse delay after the spike / the train (ms).", DefaultValueFactory = _ => 20 };
        var width = new Option<double>("--probe-width") { Description = "Test pulse width (ms).", DefaultValueFactory = _ => 2 };
        var format = new Option<string>("--format") { Description = "csv or json.", DefaultValueFactory = _ => "csv" };
        foreach (var o in new Option[] { amp, duration, delay, width, format }) c.Options.Add(o);
        c.SetAction(p =>
        {
            string fmt = p.GetValue(format)!;
            if (fmt is not ("csv" or "json")) throw new CliException("--format must be csv or json.");
            var (doc, cell, unit) = common.Load(p, ctx);
            var g = cell.Model.Geometry;
            var settings = MechanismSettings.Default with
            {
                Simulation = new SimulationSettings { DtMs = p.GetValue(common.Dt) },
                StepDurationMs = p.GetValue(duration),
                ProbeDelayMs = p.GetValue(delay),
                ProbePulseMs = p.GetValue(width),
            };
            if (settings.Problem() is { } bad) throw new CliException(bad.Replace("stepDurationMs", "--duration").Replace("probeDelayMs", "--probe-delay")
                .Replace("probePulseMs", "--probe-width"));
            double? step = p.GetValue(amp) is { } a ? CurrentUnits.ToDensity(a, unit, g) : null;
            var report = AdaptationMechanisms.Measure(cell, step, settings);
            string text = fmt == "json"
                ? MechanismCsv.Json(doc.Name, report, unit, g).ToJsonString(Json) + "\n"
                : MechanismCsv.Write(doc.Name, report, unit, g);
            ctx.Emit(text, p.GetValue(common.Out));
            return 0;
        });
        return c;
    }

    private static Command Methods(CliContext ctx)
    {
        var c = new Command("methods", "A methods paragraph for a paper (model, channels with citations and densities, temperature and Q10, " +
            "integration, protocols and read-out definitions, versions) and the BibTeX of every cited source.");
        var common = new Common();
        common.AddTo(c);
        var bib = new Option<string?>("--bibtex") { Description = "Also write the BibTeX file here." };
        var format = new Option<string>("--format")
        {
            Description = "text (the paragraph) or bibtex, to --out or standard output.",
            DefaultValueFactory = _ => "text",
        };
        c.Options.Add(bib);
        c.Options.Add(format);
        c.SetAction(p =>
        {
            string fmt = p.GetValue(format)!;
            if (fmt is not ("text" or "bibtex")) throw new CliException("--format must be text or bibtex.");
            var (doc, cell, _) = common.Load(p, ctx);
            var versions = MethodsVersions.Current(ctx.Catalog.VersionLabel);
            var settings = ReadoutSettings.Default with { Simulation = new SimulationSettings { DtMs = p.GetValue(common.Dt) } };
            string bibText = BibTex.Write(BibTex.For(cell.Model, doc.Citation, versions).Entries, ResearchCaution.Text);
            if (p.GetValue(bib) is { } bibPath) ctx.Emit(bibText, bibPath);
            ctx.Emit(fmt == "bibtex" ? bibText : MethodsText.Write(doc, cell.Model, versions, settings) + "\n", p.GetValue(common.Out));
            return 0;
        });
        return c;
    }
}
