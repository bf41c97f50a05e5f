using ExprModel.Web.Simulation;

namespace ExprModel.Web.Tests.Components;

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
        var (tt, vv) = StepView.Thin(t, v, 1500);
        Assert.True(tt.Length <= 3001);
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
        Assert.Equal(99, pv.Length); // steep everywhere: every second sample
        Assert.All(ps, s => Assert.Equal(10, s, 9));
    }
}
