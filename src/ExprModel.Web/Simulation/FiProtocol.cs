namespace ExprModel.Web.Simulation;

/// <summary>An f-I sweep: <see cref="Steps"/> steps evenly from <see cref="FromUaPerCm2"/> to <see cref="ToUaPerCm2"/>.</summary>
public sealed record FiProtocol
{
    public double FromUaPerCm2 { get; init; } = 0;
    public double ToUaPerCm2 { get; init; } = 20;
    public int Steps { get; init; } = 16;
    public double DurationMs { get; init; } = 1000;

    /// <summary>The sweep's amplitudes.</summary>
    public ExprModel.Core.Analysis.AmplitudeGrid Grid => new(FromUaPerCm2, ToUaPerCm2, Steps);

    /// <summary>This sweep over <paramref name="grid"/> (same duration).</summary>
    public FiProtocol Over(ExprModel.Core.Analysis.AmplitudeGrid grid) =>
        this with { FromUaPerCm2 = grid.FromUaPerCm2, ToUaPerCm2 = grid.ToUaPerCm2, Steps = grid.Steps };

    public string? Problem()
    {
        if (!double.IsFinite(FromUaPerCm2) || !double.IsFinite(ToUaPerCm2)
            || !(ToUaPerCm2 > FromUaPerCm2)) return "fi: toUaPerCm2 must be a number above fromUaPerCm2";
        if (Steps < 2 || Steps > 200) return $"fi.steps must lie between 2 and 200 (got {Steps})";
        if (!(DurationMs > 0) || DurationMs > 5000) return $"fi.durationMs must lie in (0, 5000] (got {DurationMs})";
        return null;
    }
}
