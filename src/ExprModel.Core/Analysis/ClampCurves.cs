using ExprModel.Core.Simulation;

namespace ExprModel.Core.Analysis;

/// <summary>
/// Each channel's curves from voltage-clamp step families, one value per command potential: the I-V relation (peak and
/// steady current), activation (peak conductance in the step, normalised to its largest value over the family) and,
/// from a conditioning family, steady-state inactivation (peak conductance in the test step after each conditioning
/// potential, normalised the same way). Normalised conductance curves are the trade's usual form (common practice).
/// </summary>
public sealed record ClampCurves
{
    /// <summary>Channel labels in the cell's order (<see cref="Simulator.ChannelLabels"/>).</summary>
    public required IReadOnlyList<string> Channels { get; init; }
    public required double[] CommandsMv { get; init; }
    public required IReadOnlyDictionary<string, double[]> PeakUaPerCm2 { get; init; }
    public required IReadOnlyDictionary<string, double[]> SteadyUaPerCm2 { get; init; }
    /// <summary>Peak conductance / its largest value over the family (null where the channel never conducts).</summary>
    public required IReadOnlyDictionary<string, double?[]> Activation { get; init; }
    /// <summary>Test-step peak conductance after each conditioning potential (the same as <see cref="CommandsMv"/>), normalised; null without a
    /// conditioning family.</summary>
    public IReadOnlyDictionary<string, double?[]>? Inactivation { get; init; }
    /// <summary>The test potential of the conditioning family (mV), when there is one.</summary>
    public double? TestMv { get; init; }

    /// <summary>Curves of a step family and, optionally, a conditioning family run over the same potentials.</summary>
    /// <exception cref="ArgumentException">The conditioning family's potentials differ from the step family's.</exception>
    public static ClampCurves From(IReadOnlyList<ClampStep> family, IReadOnlyList<ClampStep>? conditioned = null, double? testMv = null)
    {
        if (family.Count == 0) throw new ArgumentException("A clamp family needs at least one command.", nameof(family));
        if (conditioned is not null && !conditioned.Select(c => c.CommandMv).SequenceEqual(family.Select(f => f.CommandMv)))
            throw new ArgumentException("The conditioning family must use the step family's potentials.", nameof(conditioned));
        var ids = family[0].PeakUaPerCm2.Keys.ToArray();
        return new ClampCurves
        {
            Channels = ids,
            CommandsMv = family.Select(f => f.CommandMv).ToArray(),
            PeakUaPerCm2 = ids.ToDictionary(id => id, id => family.Select(f => f.PeakUaPerCm2[id]).ToArray()),
            SteadyUaPerCm2 = ids.ToDictionary(id => id, id => family.Select(f => f.SteadyUaPerCm2[id]).ToArray()),
            Activation = ids.ToDictionary(id => id, id => Normalised(family, id)),
            Inactivation = conditioned is null ? null : ids.ToDictionary(id => id, id => Normalised(conditioned, id)),
            TestMv = conditioned is null ? null : testMv,
        };
    }

    private static double?[] Normalised(IReadOnlyList<ClampStep> family, string id)
    {
        double max = family.Max(f => f.PeakConductanceMsPerCm2[id]);
        return family.Select(f => max > 0 ? f.PeakConductanceMsPerCm2[id] / max : (double?)null).ToArray();
    }
}
