using ExprModel.Core.Simulation;

namespace ExprModel.Core.Analysis;

/// <summary>The voltage-clamp read-outs of a cell: the step and the conditioning family of a <see cref="ClampProtocol"/>, as curves.</summary>
public static class ClampFamilies
{
    /// <exception cref="ArgumentException">The protocol cannot run (the message names the setting).</exception>
    public static ClampCurves Measure(CompiledCell cell, ClampProtocol protocol, double dtMs = 0.025, CancellationToken cancel = default)
    {
        if (protocol.Problem() is { } p) throw new ArgumentException(p);
        var commands = protocol.Commands();
        var family = VoltageClamp.StepFamily(cell, protocol.HoldingMv, commands, protocol.HoldMs, protocol.CommandMs, dtMs, cancel);
        var conditioned = VoltageClamp.ConditionedFamily(cell, protocol.HoldingMv, commands, protocol.ConditioningMs, protocol.TestMv,
            protocol.HoldMs, protocol.CommandMs, dtMs, cancel);
        return ClampCurves.From(family, conditioned, protocol.TestMv);
    }
}
