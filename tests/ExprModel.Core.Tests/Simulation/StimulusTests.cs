using ExprModel.Core.Simulation;

namespace ExprModel.Core.Tests.Simulation;

public class StimulusTests
{
    [Theory]
    [InlineData(100, 1000, 0.025, 44800)]
    [InlineData(0.0125, 3.3, 0.025, 500)]
    [InlineData(7, 2000, 0.01, 1000)]
    public void StepFillMatchesTheMidpointRule(double delay, double duration, double dt, int steps)
    {
        var step = new StepCurrent(delay, duration, 2.5, 0.5);
        var filled = step.Sample(dt, steps);
        for (int i = 0; i < steps; i++) Assert.Equal(step.DensityAt((i + 0.5) * dt), filled[i]);
    }
}
