using System.Globalization;
using ExprModel.Core.Stochastic;

namespace ExprModel.Core.Export;

/// <summary>
/// A patch simulation as CSV: comment lines with the caution, entry, settings, unitary conductance, open probabilities,
/// mean dwell times and the noise-analysis fit; then one row per sample (time, command, ensemble mean, variance, standard
/// error, deterministic current, kept single sweeps).
/// </summary>
public static class PatchCsv
{
    public static string Write(PatchResult r, UnitaryConductance? unitary = null)
    {
        var s = r.Settings;
        string F(double x) => x.ToString("G6", CultureInfo.InvariantCulture);
        var comments = new List<string>
        {
            $"channels: {s.ChannelCount}; sweeps: {s.Sweeps}; holding {F(s.HoldingMv)} mV; " +
            $"step {F(s.StepMv)} mV for {F(s.StepMs)} ms after {F(s.PreStepMs)} ms; " +
            $"temperature {F(s.EffectiveTemperatureC)} C; reversal {F(r.ReversalMv)} mV; seed {s.Seed}",
            $"unitary conductance: {F(s.UnitaryConductancePs)} pS" + (unitary is null ? "" : $" ({unitary.BasisLabel}; {unitary.Citation})"),
            $"unitary current at the step: {F(r.UnitaryCurrentAtStepPa)} pA",
            $"open probability, last half of the step: {F(r.MeasuredOpenProbability)} measured, {F(r.StationaryOpenProbability)} stationary",
            $"open dwells: {r.OpenDwellsMs.Count}, mean {F(Mean(r.OpenDwellsMs))} ms (theory {F(r.DwellTheory.MeanOpenMs)} ms); " +
            $"closed dwells: {r.ClosedDwellsMs.Count}, mean {F(Mean(r.ClosedDwellsMs))} ms",
            r.NoiseFit is { } fit
                ? $"variance-mean fit: i = {F(fit.UnitaryCurrentPa)} pA, N = {F(fit.ChannelCount)} ({fit.Samples} samples)"
                : "variance-mean fit: not enough spread",
            "exact stochastic simulation (Gillespie at piecewise-constant voltage); currents in pA, outward positive",
        };
        var header = new List<string> { "time_ms", "command_mv", "mean_pa", "variance_pa2", "standard_error_pa", "deterministic_pa" };
        for (int k = 0; k < r.SweepCurrentsPa.Count; k++) header.Add($"sweep_{k + 1}_pa");
        var table = CsvTable.ForModel($"{s.Entry.Key} patch", header, [.. comments]);
        for (int j = 0; j < r.TimesMs.Length; j++)
        {
            var row = new object?[header.Count];
            row[0] = r.TimesMs[j];
            row[1] = r.CommandMv[j];
            row[2] = r.MeanCurrentPa[j];
            row[3] = r.VarianceCurrentPa2[j];
            row[4] = r.StandardErrorPa[j];
            row[5] = r.DeterministicCurrentPa[j];
            for (int k = 0; k < r.SweepCurrentsPa.Count; k++) row[6 + k] = r.SweepCurrentsPa[k][j];
            table.Row(row);
        }
        return table.ToString();
    }

    private static double Mean(IReadOnlyList<double> x) => x.Count == 0 ? double.NaN : x.Average();
}
