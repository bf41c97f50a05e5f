namespace ExprModel.Core.Stochastic;

/// <summary>
/// Exact stochastic simulation of a voltage-clamped patch (Gillespie 1977, J Phys Chem 81:2340, at piecewise-constant
/// voltage): each channel is its own Markov chain on the entry's generated scheme (<see cref="MarkovScheme"/>); it stays
/// in a state for an exponential time with the state's total exit rate and then takes one of the exits with
/// probability proportional to its rate. Rates change only at the protocol's voltage steps, where the memoryless
/// waiting time is simply drawn again. Channels are independent, so simulating them one by one is exact and gives each
/// channel's open and closed dwell times. Sweeps are seeded by (seed, sweep number) and summed in a fixed order, so a
/// result does not depend on how many threads ran it.
/// </summary>
public static class PatchClamp
{
    private const int SweepsPerChunk = 8;

    public static PatchResult Run(PatchSettings settings, CancellationToken cancel = default)
    {
        if (settings.Problem() is { } problem) throw new ArgumentException(problem, nameof(settings));
        var entry = settings.Entry;
        var scheme = MarkovScheme.For(entry);
        var rates = new GateRates(entry, scheme, settings.EffectiveTemperatureC);
        double erev = settings.EffectiveReversalMv();
        double ca = settings.CalciumMm;
        int gates = scheme.KineticGates.Count;

        // Segments: holding, step, holding again (empty ones dropped).
        var segments = new List<(double Start, double End, double Mv, bool IsStep)>();
        double t0 = 0;
        if (settings.PreStepMs > 0) segments.Add((0, t0 = settings.PreStepMs, settings.HoldingMv, false));
        segments.Add((t0, t0 + settings.StepMs, settings.StepMv, true));
        if (settings.PostStepMs > 0) segments.Add((t0 + settings.StepMs, settings.TotalMs, settings.HoldingMv, false));
        double stepStart = t0, stepEnd = t0 + settings.StepMs;

        var tables = segments.Select(s => SegmentTable.For(scheme, rates, s.Mv, ca, gates)).ToArray();
        var holdingSteady = new double[gates];
        rates.SteadyAt(settings.HoldingMv, ca, holdingSteady);

        double dtS = settings.SampleIntervalMs;
        int samples = (int)Math.Floor(settings.TotalMs / dtS + 1e-9) + 1;
        var times = new double[samples];
        var command = new double[samples];
        var unitary = new double[samples];
        for (int j = 0; j < samples; j++)
        {
            times[j] = j * dtS;
            int seg = SegmentAt(segments, times[j]);
            command[j] = segments[seg].Mv;
            unitary[j] = settings.UnitaryConductancePs * (command[j] - erev) * rates.InstantaneousFactor(command[j], ca) * 1e-3;
        }
        int stepFirst = (int)Math.Ceiling(stepStart / dtS - 1e-9), stepLast = Math.Min(samples - 1, (int)Math.Floor(stepEnd / dtS - 1e-9));
        double lateFrom = stepStart + settings.StepMs / 2;

        int chunks = (settings.Sweeps + SweepsPerChunk - 1) / SweepsPerChunk;
        var partial = new ChunkResult[chunks];
        Parallel.For(0, chunks, new ParallelOptions { CancellationToken = cancel }, c =>
        {
            var r = new ChunkResult(samples);
            int first = c * SweepsPerChunk, end = Math.Min(settings.Sweeps, first + SweepsPerChunk);
            var openCount = new int[samples];
            for (int sweep = first; sweep < end; sweep++)
            {
                cancel.ThrowIfCancellationRequested();
                Array.Clear(openCount);
                var rng = new StochasticRandom(settings.Seed, sweep);
                bool dwells = sweep < settings.DwellSweeps;
                for (int ch = 0; ch < settings.ChannelCount; ch++)
                    RunChannel(scheme, tables, segments, holdingSteady, rng, openCount, dtS, stepStart, lateFrom, stepEnd,
                        dwells ? r.OpenDwells : null, dwells ? r.ClosedDwells : null, ref r.LateOpenTime);
                var current = sweep < settings.KeptSweeps ? new double[samples] : null;
                for (int j = 0; j < samples; j++)
                {
                    double i = openCount[j] * unitary[j];
                    r.Sum[j] += i;
                    r.SumSquares[j] += i * i;
                    if (current is not null) current[j] = i;
                }
                if (current is not null) r.Kept.Add(current);
            }
            partial[c] = r;
        });

        var sum = new double[samples];
        var sumSq = new double[samples];
        var kept = new List<double[]>();
        var open = new List<double>();
        var closed = new List<double>();
        double lateOpen = 0;
        foreach (var r in partial)
        {
            for (int j = 0; j < samples; j++)
            {
                sum[j] += r.Sum[j];
                sumSq[j] += r.SumSquares[j];
            }
            kept.AddRange(r.Kept);
            open.AddRange(r.OpenDwells);
            closed.AddRange(r.ClosedDwells);
            lateOpen += r.LateOpenTime;
        }
        int k = settings.Sweeps;
        var mean = new double[samples];
        var variance = new double[samples];
        var se = new double[samples];
        for (int j = 0; j < samples; j++)
        {
            mean[j] = sum[j] / k;
            variance[j] = k > 1 ? Math.Max(0, (sumSq[j] - k * mean[j] * mean[j]) / (k - 1)) : 0;
            se[j] = Math.Sqrt(variance[j] / k);
        }

        var stepAlpha = new double[gates];
        var stepBeta = new double[gates];
        var stepSteady = new double[gates];
        rates.At(settings.StepMv, ca, stepAlpha, stepBeta);
        rates.SteadyAt(settings.StepMv, ca, stepSteady);
        double stationary = scheme.StationaryOccupancy(stepSteady)[scheme.OpenState];
        VarianceMeanFit? fit = k >= 3 && stepLast > stepFirst
            ? VarianceMeanFit.Fit(mean.AsSpan(stepFirst, stepLast - stepFirst + 1), variance.AsSpan(stepFirst, stepLast - stepFirst + 1))
            : null;
        return new PatchResult
        {
            Settings = settings,
            ReversalMv = erev,
            TimesMs = times,
            CommandMv = command,
            SweepCurrentsPa = kept,
            MeanCurrentPa = mean,
            VarianceCurrentPa2 = variance,
            StandardErrorPa = se,
            DeterministicCurrentPa = Deterministic(scheme, rates, segments, holdingSteady, times, unitary, settings.ChannelCount, ca),
            UnitaryCurrentAtStepPa = settings.UnitaryConductancePs * (settings.StepMv - erev) * rates.InstantaneousFactor(settings.StepMv, ca) * 1e-3,
            OpenDwellsMs = open,
            ClosedDwellsMs = closed,
            MeasuredOpenProbability = lateOpen / ((stepEnd - lateFrom) * settings.ChannelCount * k),
            StationaryOpenProbability = stationary,
            DwellTheory = DwellTimeTheory.For(scheme, stepAlpha, stepBeta),
            NoiseFit = fit,
            StepStartSample = stepFirst,
            StepEndSample = stepLast,
        };
    }

    private static int SegmentAt(List<(double Start, double End, double Mv, bool IsStep)> segments, double t)
    {
        for (int s = 0; s < segments.Count; s++)
            if (t < segments[s].End) return s;
        return segments.Count - 1;
    }

    /// <summary>One channel through every segment, adding 1 to each sample at which it is open.</summary>
    private static void RunChannel(MarkovScheme scheme, SegmentTable[] tables, List<(double Start, double End, double Mv, bool IsStep)> segments,
        double[] holdingSteady, StochasticRandom rng, int[] openCount, double dtS, double stepStart, double lateFrom, double stepEnd,
        List<double>? openDwells, List<double>? closedDwells, ref double lateOpenTime)
    {
        int state = 0;
        for (int i = 0; i < scheme.Powers.Count; i++)
        {
            int kOpen = 0;
            for (int u = 0; u < scheme.Powers[i]; u++) if (rng.NextDouble() < holdingSteady[i]) kOpen++;
            state += kOpen * scheme.Strides[i];
        }
        int openState = scheme.OpenState;
        bool isOpen = state == openState;
        double dwellStart = double.NegativeInfinity, t = 0;
        for (int s = 0; s < segments.Count; s++)
        {
            var table = tables[s];
            double end = segments[s].End;
            while (true)
            {
                double exit = table.Exit[state];
                double next = exit > 0 ? t + rng.NextExponential(exit) : double.PositiveInfinity;
                double until = Math.Min(next, end);
                if (isOpen)
                {
                    Fill(openCount, t, until, dtS, s == segments.Count - 1 && next >= end);
                    double a = Math.Max(t, lateFrom), b = Math.Min(until, stepEnd);
                    if (b > a) lateOpenTime += b - a;
                }
                if (next >= end)
                {
                    t = end;
                    break;
                }
                t = next;
                double u = rng.NextDouble() * exit;
                var rs = table.Rates[state];
                int pick = 0;
                while (pick < rs.Length - 1 && (u -= rs[pick]) >= 0) pick++;
                while (rs[pick] == 0 && pick > 0) pick--;
                state = table.Targets[state][pick];
                bool nowOpen = state == openState;
                if (nowOpen != isOpen)
                {
                    if (dwellStart >= stepStart && t <= stepEnd) (isOpen ? openDwells : closedDwells)?.Add(t - dwellStart);
                    dwellStart = t;
                    isOpen = nowOpen;
                }
            }
        }
    }

    /// <summary>Adds 1 to every sample j with from &lt;= j dt &lt; until (and the last sample when the record ends open).</summary>
    private static void Fill(int[] counts, double from, double until, double dtS, bool toTheEnd)
    {
        int a = (int)Math.Ceiling(from / dtS - 1e-9), b = toTheEnd ? counts.Length : (int)Math.Ceiling(until / dtS - 1e-9);
        b = Math.Min(b, counts.Length);
        for (int j = Math.Max(a, 0); j < b; j++) counts[j]++;
    }

    /// <summary>N i(t) P_open(t): each gate relaxes exactly toward its steady state at each segment's voltage.</summary>
    private static double[] Deterministic(MarkovScheme scheme, GateRates rates, List<(double Start, double End, double Mv, bool IsStep)> segments,
        double[] holdingSteady, double[] times, double[] unitary, int channels, double ca)
    {
        int gates = scheme.Powers.Count;
        var x0 = (double[])holdingSteady.Clone();
        var alpha = new double[gates];
        var beta = new double[gates];
        var result = new double[times.Length];
        int j = 0;
        for (int s = 0; s < segments.Count; s++)
        {
            rates.At(segments[s].Mv, ca, alpha, beta);
            bool last = s == segments.Count - 1;
            for (; j < times.Length && (last || times[j] < segments[s].End); j++)
            {
                double dt = times[j] - segments[s].Start, p = 1;
                for (int i = 0; i < gates; i++)
                {
                    double rate = alpha[i] + beta[i], inf = alpha[i] / rate;
                    p *= Math.Pow(inf + (x0[i] - inf) * Math.Exp(-rate * dt), scheme.Powers[i]);
                }
                result[j] = channels * unitary[j] * p;
            }
            double len = segments[s].End - segments[s].Start;
            for (int i = 0; i < gates; i++)
            {
                double rate = alpha[i] + beta[i], inf = alpha[i] / rate;
                x0[i] = inf + (x0[i] - inf) * Math.Exp(-rate * len);
            }
        }
        return result;
    }

    private sealed class ChunkResult(int samples)
    {
        public readonly double[] Sum = new double[samples];
        public readonly double[] SumSquares = new double[samples];
        public readonly List<double[]> Kept = [];
        public readonly List<double> OpenDwells = [];
        public readonly List<double> ClosedDwells = [];
        public double LateOpenTime;
    }
}
