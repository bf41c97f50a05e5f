namespace ExprModel.Web.Simulation;

/// <summary>The Workbench's current-clamp step: rest, one rectangular step, recovery. Amplitudes in uA/cm2.</summary>
public sealed record StepProtocol
{
    public double AmplitudeUaPerCm2 { get; init; } = 10;
    public double DelayMs { get; init; } = 100;
    public double StepMs { get; init; } = 500;
    public double AfterMs { get; init; } = 100;
    public double TotalMs => DelayMs + StepMs + AfterMs;

    /// <summary>A problem naming the field, or null.</summary>
    public string? Problem()
    {
        if (!double.IsFinite(AmplitudeUaPerCm2) || Math.Abs(AmplitudeUaPerCm2) > 10_000) return "step.amplitudeUaPerCm2 must be a number between -10000 and 10000";
        if (!(DelayMs >= 0) || !(AfterMs >= 0) || !(StepMs > 0)) return "step: delayMs and afterMs must be >= 0 and stepMs > 0";
        if (TotalMs > 10_000) return $"step: the whole protocol may last at most 10000 ms (got {TotalMs} ms)";
        return null;
    }
}

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
    public FiProtocol Over(ExprModel.Core.Analysis.AmplitudeGrid grid) => this with { FromUaPerCm2 = grid.FromUaPerCm2, ToUaPerCm2 = grid.ToUaPerCm2, Steps = grid.Steps };

    public string? Problem()
    {
        if (!double.IsFinite(FromUaPerCm2) || !double.IsFinite(ToUaPerCm2) || !(ToUaPerCm2 > FromUaPerCm2)) return "fi: toUaPerCm2 must be a number above fromUaPerCm2";
        if (Steps < 2 || Steps > 200) return $"fi.steps must lie between 2 and 200 (got {Steps})";
        if (!(DurationMs > 0) || DurationMs > 5000) return $"fi.durationMs must lie in (0, 5000] (got {DurationMs})";
        return null;
    }
}

/// <summary>One read-out as the tables, CSV files and snapshots carry it.</summary>
public sealed record ReadoutRow(string Name, string Unit, double? Value);

/// <summary>All read-outs of one model with the extractor's notes (why a read-out is missing, for example).</summary>
public sealed record ReadoutSet(IReadOnlyList<ReadoutRow> Rows, IReadOnlyList<string> Notes)
{
    /// <summary>The f-I curve the read-outs were measured on (the library's standard sweep, 0 to 3x rheobase).</summary>
    public IReadOnlyList<FiRow> Fi { get; init; } = [];

    /// <summary>Names of read-outs still being measured (a first stage shown early); empty when the set is complete.</summary>
    public IReadOnlySet<string> Pending { get; init; } = EmptyNames;
    public bool IsComplete => Pending.Count == 0;

    /// <summary>The library's first-stage result and compiled cell, kept so the second stage can continue from it.</summary>
    internal (ExprModel.Core.Simulation.CompiledCell Cell, ExprModel.Core.Analysis.CellReadouts Stage)? Continuation { get; init; }

    /// <summary>Where the next similar model's rheobase search starts (see <see cref="ExprModel.Core.Analysis.RheobaseHint"/>).</summary>
    public ExprModel.Core.Analysis.RheobaseHint? Hint { get; init; }

    /// <summary>The rheobase search saw spiking stop and start again with the step amplitude; such a cell gives no <see cref="Hint"/>.</summary>
    public bool SpikingNotMonotone { get; init; }

    private static readonly IReadOnlySet<string> EmptyNames = new HashSet<string>();

    public double? Value(string name) => Rows.FirstOrDefault(r => r.Name == name)?.Value;
}

/// <summary>One point of an f-I curve as the plots, CSV and API carry it.</summary>
public sealed record FiRow(double CurrentUaPerCm2, int SpikesInStep, double WholeStepRateHz, double FirstIsiRateHz, double LateRateHz);
