namespace ExprModel.Core.Simulation;

/// <summary>The sum of several stimuli (e.g. a holding current plus a step plus noise).</summary>
public sealed record SummedCurrent(IReadOnlyList<Stimulus> Parts) : Stimulus
{
    public override double DensityAt(double tMs) => Parts.Sum(p => p.DensityAt(tMs));

    public override double[] Sample(double dtMs, int steps)
    {
        var s = new double[steps];
        foreach (var p in Parts)
        {
            var q = p.Sample(dtMs, steps);
            for (int i = 0; i < steps; i++) s[i] += q[i];
        }
        return s;
    }
}
