namespace ExprModel.Core.Analysis;

/// <summary>
/// A voltage-clamp family: commands from <see cref="FromMv"/> to <see cref="ToMv"/> in <see cref="IncrementMv"/> steps
/// after <see cref="HoldMs"/> at the holding potential; the conditioning family holds each command for
/// <see cref="ConditioningMs"/> and then steps to <see cref="TestMv"/> for <see cref="CommandMs"/>.
/// </summary>
public sealed record ClampProtocol
{
    public double HoldingMv { get; init; } = -80;
    public double FromMv { get; init; } = -100;
    public double ToMv { get; init; } = 40;
    public double IncrementMv { get; init; } = 10;
    public double HoldMs { get; init; } = 50;
    public double CommandMs { get; init; } = 100;
    /// <summary>Long enough for the slower inactivating gates to settle (hundreds of ms, common practice).</summary>
    public double ConditioningMs { get; init; } = 500;
    public double TestMv { get; init; } = 0;

    /// <summary>Most commands a family may hold.</summary>
    public const int MaxCommands = 200;

    /// <summary>The command potentials, from <see cref="FromMv"/> up to <see cref="ToMv"/> inclusive.</summary>
    public IReadOnlyList<double> Commands()
    {
        var commands = new List<double>();
        for (double v = FromMv; v <= ToMv + 1e-9 && commands.Count <= MaxCommands; v += IncrementMv) commands.Add(Math.Round(v, 9));
        return commands;
    }

    /// <summary>A problem naming the setting, or null when the protocol can run.</summary>
    public string? Problem()
    {
        double[] potentials = [HoldingMv, FromMv, ToMv, TestMv];
        if (potentials.Any(v => !double.IsFinite(v) || Math.Abs(v) > 300)) return "clamp: potentials must be numbers between -300 and 300 mV";
        if (!(IncrementMv > 0)) return "clamp: the increment must be a positive number of mV";
        if (ToMv < FromMv) return "clamp: the last command must not be below the first";
        if ((ToMv - FromMv) / IncrementMv + 1 > MaxCommands) return $"clamp: at most {MaxCommands} commands (widen the increment)";
        if (!(HoldMs >= 0) || !(CommandMs > 0) || !(ConditioningMs > 0)
            || HoldMs + ConditioningMs + CommandMs > 10_000) return "clamp: durations must be positive and together at most 10000 ms";
        return null;
    }
}
