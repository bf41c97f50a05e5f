using ExprModel.Core.Simulation;

namespace ExprModel.Core.Analysis;

/// <summary>
/// Finds the smallest step amplitude for which a property holds (a spike; sustained firing), assuming it holds
/// for every larger amplitude in the bracket. Each round tests several amplitudes in parallel (one lane per core)
/// and keeps the sub-interval that contains the onset: bisection generalised to k sections.
/// </summary>
/// <remarks>
/// Amplitudes are taken from a fixed grid (<see cref="OnsetGrid"/>) whose spacing is the stated tolerance, and the
/// answer is the first grid point at which the property holds. So the answer does not depend on where the search
/// starts: a search seeded with a nearby earlier answer (the Workbench's live read-outs) returns what a cold
/// search returns, in fewer rounds, whenever the property is monotone in the amplitude.
/// </remarks>
public static class RheobaseSearch
{
    /// <summary>Result of an onset search: the largest amplitude without and the smallest with the property.</summary>
    public sealed record Bracket(double BelowUaPerCm2, double AtOrAboveUaPerCm2, double ToleranceUaPerCm2)
    {
        /// <summary>Rounds of parallel probes the search took (for cost reports; not part of the answer).</summary>
        public int Rounds { get; init; }

        /// <summary>
        /// When some probe failed at a larger amplitude than one that held (the property is not monotone here), the
        /// lowest amplitude seen to hold and the highest seen to fail above it; null when every probe agreed with a
        /// single onset. The answer is then the onset the search's probe path found (never above an amplitude seen to
        /// hold), and another path can find another.
        /// </summary>
        public (double HeldUaPerCm2, double FailedAboveUaPerCm2)? NotMonotone { get; init; }
    }

    /// <summary>Amplitudes tested per round: two SIMD groups of four per core keeps every core busy.</summary>
    private static int ProbesPerRound => Math.Max(4, 4 * Environment.ProcessorCount);

    /// <summary>
    /// The amplitude grid: evenly spaced by the absolute tolerance up to n0 = ceil(1/relative) points, then
    /// geometric with ratio (1 + relative); neighbours are never further apart than max(absolute, relative x).
    /// </summary>
    public sealed class OnsetGrid
    {
        private readonly double _step, _relative, _corner, _logRatio;
        private readonly long _cornerIndex;

        public OnsetGrid(double absoluteTolerance, double relativeTolerance)
        {
            if (!(absoluteTolerance > 0) || !(relativeTolerance > 0)) throw new ArgumentOutOfRangeException(nameof(absoluteTolerance), "onset search tolerances must be positive");
            _step = absoluteTolerance;
            _relative = relativeTolerance;
            _cornerIndex = (long)Math.Ceiling(1 / relativeTolerance);
            _corner = _cornerIndex * absoluteTolerance;
            _logRatio = Math.Log(1 + relativeTolerance);
        }

        public double At(long n) => n <= _cornerIndex ? n * _step : _corner * Math.Exp((n - _cornerIndex) * _logRatio);

        /// <summary>The first grid index whose amplitude is at or above <paramref name="x"/>.</summary>
        public long Ceiling(double x)
        {
            if (x <= 0) return 0;
            long n = x <= _corner ? (long)Math.Ceiling(x / _step) : _cornerIndex + (long)Math.Ceiling(Math.Log(x / _corner) / _logRatio);
            // Guard the rounding of the logarithm: step to the exact first point at or above x.
            while (n > 0 && At(n - 1) >= x) n--;
            while (At(n) < x) n++;
            return n;
        }

        /// <summary>The last grid index whose amplitude is at or below <paramref name="x"/>.</summary>
        public long Floor(double x)
        {
            long n = Ceiling(x);
            return At(n) > x ? n - 1 : n;
        }
    }

    /// <param name="known">A bracket already established (property fails at Below, holds at Above).</param>
    /// <param name="hint">An amplitude near the expected onset (for example the answer for a slightly different cell):
    /// the first round probes the grid points around it. It changes the work done, not the answer.</param>
    public static Bracket? FindOnset(Func<IReadOnlyList<double>, bool[]> holds, double startUaPerCm2, double maxUaPerCm2,
        double absoluteTolerance, double relativeTolerance, CancellationToken cancel = default, (double Below, double Above)? known = null,
        double? hint = null)
    {
        var grid = new OnsetGrid(absoluteTolerance, relativeTolerance);
        long max = grid.Floor(maxUaPerCm2 * 1.000001);
        int lanes = ProbesPerRound;
        // Invariant once bracketed: the property fails at lo (index 0 is zero current, assumed to fail) and holds at hi.
        long lo = 0, hi;
        int rounds = 0;
        // Every index tested and its result, with the lowest seen to hold and the highest seen to fail: to notice a
        // property that is not monotone, and to keep the answer at or below every amplitude seen to hold.
        var tested = new Dictionary<long, bool>();
        long lowestHeld = long.MaxValue, highestFailed = -1;
        bool[] Test(long[] idx)
        {
            cancel.ThrowIfCancellationRequested();
            rounds++;
            var ok = holds(idx.Select(grid.At).ToArray());
            for (int i = 0; i < idx.Length; i++)
            {
                tested[idx[i]] = ok[i];
                if (ok[i]) lowestHeld = Math.Min(lowestHeld, idx[i]);
                else highestFailed = Math.Max(highestFailed, idx[i]);
            }
            return ok;
        }

        if (known is { } k)
        {
            lo = Math.Max(0, grid.Floor(k.Below));
            hi = grid.Ceiling(k.Above);
        }
        else if (hint is { } h && h > 0 && grid.Ceiling(h) <= max)
        {
            // Seeded: grid points around the hint, dense next to it and sparser further out. An onset within about two
            // grid steps of the hint is settled in this round, one within about eight in the next (whose few probes
            // are then all the points left in the bracket).
            long centre = grid.Ceiling(h);
            long[] offsets = lanes >= 8 ? [-8, -4, -2, -1, 0, 1, 3, 7] : Enumerable.Range(-lanes / 2, lanes).Select(i => (long)i).ToArray();
            var idx = offsets.Select(o => centre + o).Where(n => n >= 1 && n <= max).Distinct().ToArray();
            var ok = Test(idx);
            int at = Array.IndexOf(ok, true);
            if (at > 0) return Narrow(idx[at - 1], idx[at]);
            if (at == 0)
            {
                // Holds everywhere in the window: widen downwards by doubling distances until it fails.
                hi = idx[0];
                var down = Enumerable.Range(0, lanes).Select(i => hi - (2L << i)).Where(n => n > 0).ToArray();
                if (down.Length > 0)
                {
                    var okDown = Test(down);
                    int fail = Array.IndexOf(okDown, false);
                    if (fail >= 0) { lo = down[fail]; hi = fail == 0 ? hi : down[fail - 1]; }
                    else hi = down[^1];
                }
            }
            else
            {
                lo = idx[^1];
                if (lo >= max) return null;
                // Fails everywhere in the window: widen upwards by doubling distances until it holds.
                var up = Enumerable.Range(0, lanes).Select(i => lo + (2L << i)).Select(n => Math.Min(n, max)).Distinct().ToArray();
                var okUp = Test(up);
                int hold = Array.IndexOf(okUp, true);
                if (hold < 0) return up[^1] >= max ? null : Grow(grid.At(up[^1]) * 1.3, up[^1]);
                hi = up[hold];
                lo = hold == 0 ? lo : up[hold - 1];
            }
        }
        else
        {
            return Grow(Math.Max(startUaPerCm2, grid.At(1)), 0);
        }
        return Narrow(lo, hi);

        // Grow geometrically (x 1.3 per probe) from an amplitude until the property holds, then narrow; the property
        // is known to fail at grid index 'low'.
        Bracket? Grow(double from, long low)
        {
            double next = from;
            while (true)
            {
                var idx = Enumerable.Range(0, lanes).Select(i => grid.Ceiling(next * Math.Pow(1.3, i))).Where(n => n <= max).Distinct().ToArray();
                if (idx.Length == 0) return null;
                var ok = Test(idx);
                int first = Array.IndexOf(ok, true);
                if (first >= 0) return Narrow(first == 0 ? low : idx[first - 1], idx[first]);
                low = idx[^1];
                if (low >= max) return null;
                next = grid.At(low) * 1.3;
            }
        }

        // k-section on grid indices until the bracket is one grid step wide.
        Bracket Narrow(long below, long above)
        {
            while (true)
            {
                (below, above) = NarrowTo(below, above);
                // Not monotone, and a probe below the bracket held (seen while widening past a gap): the onset asked for
                // lies at or below that probe, so narrow again between it and the highest failure below it.
                if (lowestHeld >= above) break;
                above = lowestHeld;
                below = tested.Where(t => !t.Value && t.Key < above).Select(t => t.Key).DefaultIfEmpty(0).Max();
            }
            return new Bracket(grid.At(below), grid.At(above), grid.At(above) - grid.At(below))
            {
                Rounds = rounds,
                NotMonotone = highestFailed > lowestHeld ? (grid.At(lowestHeld), grid.At(highestFailed)) : null,
            };
        }

        (long Below, long Above) NarrowTo(long below, long above)
        {
            while (above - below > 1)
            {
                long gap = above - below;
                var idx = gap - 1 <= lanes
                    ? Enumerable.Range(1, (int)(gap - 1)).Select(i => below + i).ToArray()
                    : Enumerable.Range(1, lanes).Select(i => below + (long)Math.Round((double)gap * i / (lanes + 1))).Distinct().ToArray();
                var ok = Test(idx);
                int first = Array.IndexOf(ok, true);
                if (first < 0) below = idx[^1];
                else
                {
                    above = idx[first];
                    if (first > 0) below = idx[first - 1];
                }
            }
            return (below, above);
        }
    }

    /// <summary>Time before the first spike at which the search keeps a resume point for the spike-shape run (ms).</summary>
    public const double ResumeMarginMs = 20;

    /// <summary>Result of the rheobase search.</summary>
    /// <param name="Bracket">The onset bracket (null: no spike up to the maximum).</param>
    /// <param name="LatencyMs">First spike time (ms from step onset) at the rheobase step, as the search saw it.</param>
    /// <param name="BeforeFirstSpike">Where a recorded run of the rheobase step can start, at least <see cref="ResumeMarginMs"/>
    /// before its first spike (null when the sweep could not keep one).</param>
    /// <param name="OutOfRangeFromUaPerCm2">The smallest probed step that drove the membrane out of the physical range
    /// (|V| of 1000 mV or more: the model has no stable response there); such steps count as no spike. Null when none did.</param>
    public sealed record RheobaseResult(Bracket? Bracket, double? LatencyMs, ResumePoint? BeforeFirstSpike, double? OutOfRangeFromUaPerCm2 = null);

    /// <summary>
    /// Rheobase: the smallest step that evokes at least one spike. Also returns the first spike time at that amplitude
    /// and a resume point shortly before that spike, so the spike-shape run need not simulate the whole latency again.
    /// </summary>
    public static RheobaseResult Rheobase(CompiledCell cell, CellState rest, double startUaPerCm2, double maxUaPerCm2, ReadoutSettings s,
        CancellationToken cancel = default, double? hint = null)
    {
        var seen = new Dictionary<double, (double Latency, ResumePoint? Resume)>();
        double? outOfRange = null;
        double duration = FiCurve.DefaultDelayMs + s.StepDurationMs + 20;
        // Only "any spike in the step" matters here, so each run may end at its first spike.
        var settings = s.Simulation with { StopAtFirstSpikeAfterMs = FiCurve.DefaultDelayMs };
        IReadOnlyList<SweepLane?> Run(IReadOnlyList<double> amps) =>
            Simulator.Sweep(cell, amps.Select(a => (Stimulus)Protocols.Step(a, FiCurve.DefaultDelayMs, s.StepDurationMs)).ToArray(), duration, settings, rest, ResumeMarginMs, cancel);
        var bracket = FindOnset(amps =>
        {
            IReadOnlyList<SweepLane?> lanes;
            try
            {
                lanes = Run(amps);
            }
            catch (SimulationBlowUpException)
            {
                // A step the model cannot follow (the membrane runs past 1000 mV) stops its whole SIMD group: run the
                // round's steps one at a time to keep the others' answers, and count the runaway ones as no spike.
                lanes = amps.Select(a =>
                {
                    try { return Run([a])[0]; }
                    catch (SimulationBlowUpException) { outOfRange = Math.Min(outOfRange ?? double.PositiveInfinity, a); return null; }
                }).ToArray();
            }
            var holds = new bool[amps.Count];
            for (int i = 0; i < amps.Count; i++)
            {
                if (lanes[i] is not { } lane) continue;
                var p = FiCurve.Point(amps[i], lane.SpikeTimesMs, FiCurve.DefaultDelayMs, s.StepDurationMs);
                if (p.FirstSpikeLatencyMs is { } l) seen[amps[i]] = (l, lane.BeforeFirstSpike);
                holds[i] = p.SpikesInStep > 0;
            }
            return holds;
        }, startUaPerCm2, maxUaPerCm2, s.RheobaseAbsoluteToleranceUaPerCm2, s.RheobaseRelativeTolerance, cancel, hint: hint);
        return bracket is not null && seen.TryGetValue(bracket.AtOrAboveUaPerCm2, out var at)
            ? new RheobaseResult(bracket, at.Latency, at.Resume, outOfRange)
            : new RheobaseResult(bracket, null, null, outOfRange);
    }
}
