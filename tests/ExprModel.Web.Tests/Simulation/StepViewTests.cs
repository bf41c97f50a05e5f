using ExprModel.Web.Simulation;

namespace ExprModel.Web.Tests.Simulation;

public sealed class StepViewTests
{
    [Fact]
    public void Thinning_keeps_every_bucket_extreme()
    {
        int n = 40_000;
        var t = Enumerable.Range(0, n).Select(i => i * 0.025).ToArray();
        var v = t.Select(x => -65.0).ToArray();
        v[12_345] = 30; // one narrow spike peak
        v[30_001] = -90;
        var (tt, vv) = StepView.Thin(t, v, ModelRunner.PlotBuckets);
        Assert.True(tt.Length <= 2 * ModelRunner.PlotBuckets + 1);
        Assert.Contains(30.0, vv);
        Assert.Contains(-90.0, vv);
        Assert.Equal(t[^1], tt[^1]);
        for (int i = 1; i < tt.Length; i++) Assert.True(tt[i] > tt[i - 1]);
    }

    [Fact]
    public void Phase_slope_is_the_derivative()
    {
        var t = Enumerable.Range(0, 200).Select(i => i * 0.025).ToArray();
        var v = t.Select(x => 10 * x).ToArray(); // 10 mV/ms everywhere
        var (pv, ps) = StepView.Phase(t, v);
        Assert.Equal(198, pv.Length); // every interior sample lies in a new cell of the grid
        Assert.All(ps, s => Assert.Equal(10, s, 9));
    }

    [Fact]
    public void Repeated_loops_are_drawn_once_with_breaks_not_false_segments()
    {
        // Twenty identical cycles of V = 40 sin(2 pi t / 20 ms), sampled every 25 us: dV/dt = 4 pi cos(...) mV/ms.
        var t = Enumerable.Range(0, 16_000).Select(i => i * 0.025).ToArray();
        var v = t.Select(x => 40 * Math.Sin(2 * Math.PI * x / 20)).ToArray();
        var (pv, ps) = StepView.Phase(t, v);
        int kept = pv.Count(double.IsFinite);
        int oneCycle = 800; // samples per cycle
        Assert.True(kept < 2 * oneCycle, $"kept {kept} points for 20 repeated cycles");
        Assert.True(kept > 300, $"kept {kept}: the loop must still be drawn");
        Assert.Equal(pv.Length, ps.Length);
        for (int i = 0; i < pv.Length; i++)
        {
            Assert.Equal(double.IsNaN(pv[i]), double.IsNaN(ps[i]));
            if (double.IsNaN(pv[i])) continue;
            // Every kept point lies on the true curve: (V/40)^2 + (slope / (4 pi))^2 = 1 (central differences: 1e-3).
            double r = Math.Pow(pv[i] / 40, 2) + Math.Pow(ps[i] / (4 * Math.PI), 2);
            Assert.Equal(1, r, 2);
        }
        Assert.False(double.IsNaN(pv[0]));
    }
}
