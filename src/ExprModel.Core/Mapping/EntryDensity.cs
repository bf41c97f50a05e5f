namespace ExprModel.Core.Mapping;

/// <summary>One entry's density under a <see cref="DensityRule"/> and how it came about.</summary>
/// <param name="Expression">The entry's expression averaged over the target cells.</param>
/// <param name="Reference">What the expression is divided by.</param>
/// <param name="RawMsPerCm2">The density before clamping.</param>
/// <param name="DensityMsPerCm2">The density after clamping (the model's).</param>
/// <param name="ClampNote">Why the density was clamped (for the user to read), or null.</param>
public sealed record EntryDensity(double Expression, double Reference, double Ratio, double RawMsPerCm2, double DensityMsPerCm2, bool Clamped,
    string? ClampNote);
