namespace ExprModel.Core.Tests.Simulation;

/// <summary>A test of the SIMD kernel or its inlined functions: skipped, with the reason, on a CPU without AVX2 and FMA.</summary>
public sealed class SimdFactAttribute : FactAttribute
{
    public SimdFactAttribute()
    {
        if (SimdSupport.Missing is { } reason) Skip = reason;
    }
}
