using ExprModel.Core.Cell;
using ExprModel.Core.Stochastic;

namespace ExprModel.Core.Export;

/// <summary>
/// A run with channel noise as CSV: the caution, the method, the channel counts (with each type's method) and seed as
/// comments, then time, V and spike marks.
/// </summary>
public static class NoisyTraceCsv
{
    public static string Write(string modelName, CellModel model, NoisyTrace trace, ChannelNoiseSettings settings)
    {
        var counts = string.Join("; ", model.Channels.Select((c, i) => trace.ChannelCounts[i] > 0
            ? $"{c.Entry.Id} {trace.ChannelCounts[i]} channels of {settings.UnitaryConductancesPs[i]:G4} pS ({MethodName(trace, i)})"
            : $"{c.Entry.Id} deterministic"));
        var table = CsvTable.ForModel(modelName, ["time_ms", "v_mv"],
            $"channel noise: {settings.MethodSummary}; seed {settings.Seed}; step {settings.DtMs} ms",
            "channels: " + counts,
            "spikes: " + string.Join(" ", trace.SpikeTimesMs.Select(t => t.ToString("F3", System.Globalization.CultureInfo.InvariantCulture))));
        for (int j = 0; j < trace.TimeMs.Length; j++) table.Row(trace.TimeMs[j], trace.VoltageMv[j]);
        return table.ToString();
    }

    private static string MethodName(NoisyTrace trace, int channel) =>
        channel < trace.Methods.Count && trace.Methods[channel] == ChannelNoiseMethod.Diffusion ? "diffusion" : "binomial tracking";
}
