using ExprModel.Core.Analysis;

namespace ExprModel.Core.Tests.Analysis;

public class AmplitudeGridTests
{
    [Theory]
    [InlineData(2)]
    [InlineData(8)]
    [InlineData(9)]
    [InlineData(16)]
    [InlineData(17)]
    [InlineData(200)]
    public void Chunks_are_near_equal_and_together_are_the_grid(int steps)
    {
        var grid = new AmplitudeGrid(-1.5, 20, steps);
        var chunks = grid.Chunks();
        Assert.Equal(steps, chunks.Sum(c => c.Steps));
        Assert.All(chunks, c => Assert.InRange(c.Steps, 2, AmplitudeGrid.DefaultChunkSteps));
        Assert.True(chunks.Max(c => c.Steps) - chunks.Min(c => c.Steps) <= 1);
        var whole = Protocols.StepFamily(grid.FromUaPerCm2, grid.ToUaPerCm2, steps).Select(s => s.AmplitudeUaPerCm2).ToArray();
        var joined = chunks.SelectMany(c => Protocols.StepFamily(c.FromUaPerCm2, c.ToUaPerCm2, c.Steps)).Select(s => s.AmplitudeUaPerCm2).ToArray();
        Assert.Equal(whole.Length, joined.Length);
        for (int i = 0; i < whole.Length; i++) Assert.Equal(whole[i], joined[i], 12);
    }

    [Fact]
    public void A_sweep_run_in_chunks_counts_the_same_spikes_as_in_one_go()
    {
        var cell = TestCatalog.Preset("wb1996");
        var grid = new AmplitudeGrid(0, 3, 11);
        var whole = FiCurve.Measure(cell, grid.FromUaPerCm2, grid.ToUaPerCm2, grid.Steps, 300);
        var chunked = grid.Chunks(4).SelectMany(c => FiCurve.Measure(cell, c.FromUaPerCm2, c.ToUaPerCm2, c.Steps, 300)).ToArray();
        Assert.Equal(whole.Select(p => p.SpikesInStep), chunked.Select(p => p.SpikesInStep));
        Assert.Contains(whole, p => p.SpikesInStep > 0);
    }

    [Fact]
    public void Spacing_is_the_distance_between_neighbours() => Assert.Equal(0.5, new AmplitudeGrid(1, 5, 9).SpacingUaPerCm2, 12);
}
