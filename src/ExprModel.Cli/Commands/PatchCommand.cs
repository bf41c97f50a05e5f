using System.CommandLine;
using ExprModel.Core.Export;
using ExprModel.Core.Stochastic;

namespace ExprModel.Cli.Commands;

/// <summary>exprmodel patch ENTRY: N channels of one catalog entry under voltage clamp, simulated exactly.</summary>
public static class PatchCommand
{
    public static Command Create(CliContext ctx)
    {
        var c = new Command("patch", "Stochastic patch: N channels of one catalog entry under a voltage step, simulated exactly; writes CSV.");
        var entry = new Argument<string>("entry") { Description = "Catalog entry id (optionally id@version)." };
        var channels = new Option<int>("--channels") { Description = "Channels in the patch (1 to 10000).", DefaultValueFactory = _ => 10 };
        var holding = new Option<double>("--holding") { Description = "Holding potential (mV).", DefaultValueFactory = _ => -90 };
        var step = new Option<double>("--step") { Description = "Step potential (mV).", DefaultValueFactory = _ => 0 };
        var before = new Option<double>("--before") { Description = "Time at holding before the step (ms).", DefaultValueFactory = _ => 5 };
        var duration = new Option<double>("--duration") { Description = "Step length (ms).", DefaultValueFactory = _ => 50 };
        var after = new Option<double>("--after") { Description = "Time back at holding after the step (ms).", DefaultValueFactory = _ => 0 };
        var sweeps = new Option<int>("--sweeps") { Description = "Sweeps (the ensemble).", DefaultValueFactory = _ => 100 };
        var keep = new Option<int>("--keep") { Description = "Single sweeps written as columns.", DefaultValueFactory = _ => 5 };
        var conductance = new Option<double?>("--conductance") { Description = "Unitary conductance (pS); default: the catalog's value for the entry." };
        var temperature = new Option<double?>("--temperature") { Description = "Temperature (C); default: the entry's own." };
        var calcium = new Option<double>("--calcium") { Description = "Intracellular calcium for calcium gates (mM).", DefaultValueFactory = _ => 5e-5 };
        var sample = new Option<double>("--sample") { Description = "Sample interval (ms).", DefaultValueFactory = _ => 0.05 };
        var seed = new Option<long>("--seed") { Description = "Random seed (same seed, same result).", DefaultValueFactory = _ => 1 };
        var dwells = new Option<string?>("--dwells") { Description = "Also write open and closed dwell times (ms) to this CSV file." };
        var out_ = new Option<string?>("--out") { Description = "Write to this file instead of standard output." };
        var db = new Option<string?>("--db") { Description = "Catalog database file." };
        c.Arguments.Add(entry);
        foreach (var o in new Option[] { channels, holding, step, before, duration, after, sweeps, keep })
            c.Options.Add(o);
        foreach (var o in new Option[] { conductance, temperature, calcium, sample, seed, dwells, out_, db })
            c.Options.Add(o);
        c.SetAction(p =>
        {
            ctx.DatabasePath = p.GetValue(db);
            var id = p.GetValue(entry)!;
            int? version = null;
            if (id.Split('@') is [var name, var v])
            {
                if (!int.TryParse(v, out var n)) throw new CliException($"entry '{id}': the version after @ must be a whole number.");
                (id, version) = (name, n);
            }
            var e = ctx.Catalog.Resolve(id, version);
            var unitary = ctx.Catalog.UnitaryConductances.For(e);
            var settings = new PatchSettings
            {
                Entry = e,
                UnitaryConductancePs = p.GetValue(conductance) ?? unitary.ConductancePs,
                ChannelCount = p.GetValue(channels),
                HoldingMv = p.GetValue(holding),
                StepMv = p.GetValue(step),
                PreStepMs = p.GetValue(before),
                StepMs = p.GetValue(duration),
                PostStepMs = p.GetValue(after),
                Sweeps = p.GetValue(sweeps),
                KeptSweeps = Math.Max(0, p.GetValue(keep)),
                TemperatureC = p.GetValue(temperature),
                CalciumMm = p.GetValue(calcium),
                SampleIntervalMs = p.GetValue(sample),
                Seed = p.GetValue(seed),
            };
            if (settings.Problem() is { } problem) throw new CliException(problem);
            var result = PatchClamp.Run(settings);
            ctx.Emit(PatchCsv.Write(result, p.GetValue(conductance) is null ? unitary : null), p.GetValue(out_));
            if (p.GetValue(dwells) is { } dwellFile)
            {
                var table = CsvTable.ForModel($"{e.Key} patch", ["kind", "dwell_ms"]);
                foreach (var d in result.OpenDwellsMs) table.Row("open", d);
                foreach (var d in result.ClosedDwellsMs) table.Row("closed", d);
                ctx.Emit(table.ToString(), dwellFile);
            }
            return 0;
        });
        return c;
    }
}
