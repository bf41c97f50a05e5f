using ExprModel.Core.Perturbation;
using MathNet.Numerics.LinearAlgebra;

namespace ExprModel.Core.Tests.Perturbation;

/// <summary>Identifiability against the linearised least-squares covariance (J^T J)^-1 computed by MathNet.Numerics directly.</summary>
public class IdentifiabilityTests
{
    [Fact]
    public void Data_sd_equals_the_square_root_of_the_inverse_normal_matrix_diagonal()
    {
        double[,] j = { { 4, 1, 0 }, { 0, 3, 1 }, { 1, 0, 5 }, { 2, 2, 2 } };
        var r = Identifiability.Analyse(j, ["a", "b", "c"], Math.Log(1.5));
        var m = Matrix<double>.Build.DenseOfArray(j);
        var cov = (m.Transpose() * m).Inverse();
        for (int k = 0; k < 3; k++) Assert.Equal(Math.Sqrt(cov[k, k]), r.DataSdLn[k], 10);
        Assert.All(r.Pinned, Assert.True);
    }

    [Fact]
    public void A_channel_the_data_do_not_see_is_left_free()
    {
        // Two read-outs that both depend only on a + b: the difference a - b and the unseen c are free.
        double[,] j = { { 3, 3, 0 }, { 5, 5, 0 } };
        var r = Identifiability.Analyse(j, ["a", "b", "c"], Math.Log(1.5));
        Assert.False(r.IsPinned("a"));
        Assert.False(r.IsPinned("c"));
        Assert.True(double.IsPositiveInfinity(r.DataSdLn[2]));
        Assert.Equal([true, false, false], r.DirectionPinned);
        Assert.Contains("+0.71 a +0.71 b", r.Directions[0]);
    }
}
