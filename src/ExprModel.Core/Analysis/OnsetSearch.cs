namespace ExprModel.Core.Analysis;

/// <summary>
/// Onset search on a fixed amplitude grid: finds the smallest step amplitude for which a property holds (a spike for
/// the rheobase, late firing for the onset of sustained firing, silence for depolarisation block), assuming it holds
/// for every larger amplitude in the bracket. Each round tests several amplitudes in parallel (one lane per core)
/// and keeps the sub-interval that contains the onset: bisection generalised to k sections.
/// </summary>
/// <remarks>
/// Amplitudes are taken from a fixed grid (<see cref="OnsetGrid"/>) whose spacing is the stated tolerance, and the
/// answer is the first grid point at which the property holds. So the answer does not depend on where the search
/// starts: a search seeded with a nearby earlier answer (the rheobase of a cell whose densities differ a little)
/// returns what a cold search returns, in fewer rounds, whenever the property is monotone in the amplitude.
/// </remarks>
public static class OnsetSearch
{
    /// <summary>
    /// Amplitudes tested per round: two SIMD groups of four. Fixed, not scaled with the machine's cores: for a cell
    /// whose spiking is not monotone in the amplitude, the grid points probed decide which onset is found, so a count
    /// that followed the core count would give such a cell a different rheobase on a bigger machine (or a cluster
    /// node) than on this one, and a shared model or a sharded batch would not reproduce. Batches parallelise over
    /// cells instead.
    /// </summary>
    internal const int ProbesPerRound = 8;

    /// <param name="known">A bracket already established (property fails at Below, holds at Above).</param>
    /// <param name="hint">An amplitude near the expected onset (for example the answer for a slightly different cell):
    /// the first round probes the grid points around it. It changes the work done, not the answer.</param>
    public static OnsetBracket? FindOnset(Func<IReadOnlyList<double>, bool[]> holds, double startUaPerCm2, double maxUaPerCm2,
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
        OnsetBracket? Grow(double from, long low)
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
        OnsetBracket Narrow(long below, long above)
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
            return new OnsetBracket(grid.At(below), grid.At(above), grid.At(above) - grid.At(below))
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
}
