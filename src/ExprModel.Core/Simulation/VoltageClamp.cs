namespace ExprModel.Core.Simulation;

/// <summary>
/// Ideal voltage clamp: V is held at the command, so each gate follows its exact exponential relaxation toward
/// the steady state at that voltage (the equations are linear in the gate for fixed V).
/// </summary>
public static class VoltageClamp
{
    public static IReadOnlyList<ClampStep> StepFamily(CompiledCell cell, double holdingMv, IReadOnlyList<double> commandsMv,
        double holdMs = 50, double stepMs = 100, double dtMs = 0.025, CancellationToken cancel = default)
    {
        var result = new ClampStep[commandsMv.Count];
        Parallel.For(0, commandsMv.Count, new ParallelOptions { CancellationToken = cancel },
            i => result[i] = Run(cell, holdingMv, [(holdingMv, holdMs)], commandsMv[i], stepMs, dtMs));
        return result;
    }

    /// <summary>
    /// A conditioning family (the steady-state inactivation protocol, common practice): from the holding potential each
    /// sweep steps to one conditioning potential for <paramref name="conditioningMs"/>, then to the test potential for
    /// <paramref name="testMs"/>; peak and steady currents and the peak conductance are measured in the test step. Each
    /// result's <see cref="ClampStep.CommandMv"/> is its conditioning potential.
    /// </summary>
    public static IReadOnlyList<ClampStep> ConditionedFamily(CompiledCell cell, double holdingMv, IReadOnlyList<double> conditioningMv,
        double conditioningMs, double testMv, double holdMs = 50, double testMs = 50, double dtMs = 0.025, CancellationToken cancel = default)
    {
        var result = new ClampStep[conditioningMv.Count];
        Parallel.For(0, conditioningMv.Count, new ParallelOptions { CancellationToken = cancel },
            i => result[i] = Run(cell, holdingMv, [(holdingMv, holdMs), (conditioningMv[i], conditioningMs)], testMv, testMs, dtMs) with
            {
                CommandMv = conditioningMv[i],
            });
        return result;
    }

    /// <summary>
    /// Runs from the steady state at <paramref name="holdingMv"/> through <paramref name="before"/> (potential, ms; the
    /// first segment's potential is the holding potential's, whatever is given) and then <paramref name="stepMs"/> at
    /// <paramref name="commandMv"/>, measuring in that last step.
    /// </summary>
    private static ClampStep Run(CompiledCell cell, double holdingMv, (double Mv, double Ms)[] before, double commandMv, double stepMs, double dtMs)
    {
        var state = cell.SteadyState(holdingMv);
        var x = state.Gates;
        double ca = state.CalciumMm, na = state.SodiumMm;
        var ends = new int[before.Length];
        int holdSteps = 0;
        for (int k = 0; k < before.Length; k++) ends[k] = holdSteps += (int)Math.Round(before[k].Ms / dtMs);
        int steps = (int)Math.Round(stepMs / dtMs);
        int total = holdSteps + steps;
        var t = new double[total + 1];
        var currents = Enumerable.Range(0, cell.ChannelCount).Select(_ => new double[total + 1]).ToArray();
        var conductance = new double[cell.ChannelCount];
        int segment = 0;
        for (int s = 0; s <= total; s++)
        {
            while (segment < ends.Length && s > ends[segment]) segment++;
            double v = segment == ends.Length ? commandMv : segment == 0 ? holdingMv : before[segment].Mv;
            t[s] = s * dtMs;
            if (s > 0)
            {
                for (int g = 0; g < cell.GateCount; g++)
                {
                    double inf = cell.GateSteadyState(g, v, ca, na);
                    if (cell.GateIsInstantaneous[g]) { x[g] = inf; continue; }
                    double tau = cell.GateTimeConstantMs(g, v, ca);
                    x[g] = inf + (x[g] - inf) * Math.Exp(-dtMs / tau);
                }
                if (cell.HasShell)
                {
                    double ica = cell.CalciumCurrent(v, x, ca);
                    double caInf = cell.ShellRestMm - cell.ShellInflowPerCurrent * cell.ShellDecayMs * ica;
                    ca = Math.Max(0, caInf + (ca - caInf) * Math.Exp(-dtMs / cell.ShellDecayMs));
                }
                if (cell.HasSodiumShell)
                {
                    double ina = cell.SodiumCurrent(v, x, ca);
                    double naInf = cell.SodiumShellRestMm - cell.SodiumInflowPerCurrent * cell.SodiumShellDecayMs * ina;
                    na = Math.Max(0, naInf + (na - naInf) * Math.Exp(-dtMs / cell.SodiumShellDecayMs));
                }
            }
            for (int c = 0; c < cell.ChannelCount; c++)
            {
                currents[c][s] = cell.ChannelCurrent(c, v, x, ca);
                if (s > holdSteps) conductance[c] = Math.Max(conductance[c], cell.Conductance(c, x));
            }
        }
        var labels = new Dictionary<string, double[]>();
        for (int c = 0; c < cell.ChannelCount; c++) labels[Simulator.UniqueLabel(cell, c, labels)] = currents[c];
        var keys = labels.Keys.ToArray();
        var peak = new Dictionary<string, double>();
        var steady = new Dictionary<string, double>();
        var gmax = new Dictionary<string, double>();
        int tail = Math.Max(1, steps / 20);
        for (int c = 0; c < keys.Length; c++)
        {
            var cur = labels[keys[c]];
            double best = 0;
            for (int s = holdSteps + 1; s <= total; s++) if (Math.Abs(cur[s]) > Math.Abs(best)) best = cur[s];
            peak[keys[c]] = best;
            double sum = 0;
            for (int s = total - tail + 1; s <= total; s++) sum += cur[s];
            steady[keys[c]] = sum / tail;
            gmax[keys[c]] = conductance[c];
        }
        return new ClampStep(commandMv, t, labels) { PeakUaPerCm2 = peak, SteadyUaPerCm2 = steady, PeakConductanceMsPerCm2 = gmax };
    }
}
