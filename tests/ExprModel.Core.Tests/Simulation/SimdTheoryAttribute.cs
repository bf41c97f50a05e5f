namespace ExprModel.Core.Tests.Simulation;

/// <summary>A data-driven test of the SIMD kernel: skipped, with the reason, on a CPU without AVX2 and FMA.</summary>
public sealed class SimdTheoryAttribute : TheoryAttribute
{
    public SimdTheoryAttribute()
    {
        if (SimdSupport.Missing is { } reason) Skip = reason;
    }
}
