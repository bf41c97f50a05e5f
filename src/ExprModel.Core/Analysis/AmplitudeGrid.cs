namespace ExprModel.Core.Analysis;

/// <summary>
/// <see cref="Steps"/> step amplitudes evenly from <see cref="FromUaPerCm2"/> to <see cref="ToUaPerCm2"/> inclusive (an
/// f-I sweep's grid), and its split into consecutive chunks so a long sweep can report progress and stop between chunks.
/// </summary>
public sealed record AmplitudeGrid(double FromUaPerCm2, double ToUaPerCm2, int Steps)
{
    /// <summary>Steps per chunk at most, by default.</summary>
    public const int DefaultChunkSteps = 8;

    /// <summary>Spacing of neighbouring amplitudes (uA/cm2); 0 for a one-step grid.</summary>
    public double SpacingUaPerCm2 => Steps > 1 ? (ToUaPerCm2 - FromUaPerCm2) / (Steps - 1) : 0;

    /// <summary>
    /// Near-equal consecutive chunks of at most <paramref name="maxSteps"/> amplitudes (sizes differ by one at most, the
    /// larger first), which together are this grid; each has at least two amplitudes when the grid has, as an f-I sweep
    /// needs two ends.
    /// </summary>
    public IReadOnlyList<AmplitudeGrid> Chunks(int maxSteps = DefaultChunkSteps)
    {
        if (maxSteps < 2) throw new ArgumentOutOfRangeException(nameof(maxSteps), $"a chunk needs room for two steps (got {maxSteps})");
        if (Steps < 1) throw new InvalidOperationException($"an amplitude grid needs at least one step (got {Steps})");
        int chunks = (Steps + maxSteps - 1) / maxSteps;
        double spacing = SpacingUaPerCm2;
        var parts = new AmplitudeGrid[chunks];
        int start = 0;
        for (int k = 0; k < chunks; k++)
        {
            int n = Steps / chunks + (k < Steps % chunks ? 1 : 0);
            parts[k] = new AmplitudeGrid(FromUaPerCm2 + start * spacing, FromUaPerCm2 + (start + n - 1) * spacing, n);
            start += n;
        }
        return parts;
    }
}
