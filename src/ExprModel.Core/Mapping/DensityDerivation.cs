namespace ExprModel.Core.Mapping;

/// <summary>Why one entry's density is what it is.</summary>
public sealed record DensityDerivation(string EntryId, int Version, double Expression, double Reference, double Ratio, double TypicalMsPerCm2,
    double RawMsPerCm2, double DensityMsPerCm2, bool Clamped, IReadOnlyList<GeneContribution> Genes);
