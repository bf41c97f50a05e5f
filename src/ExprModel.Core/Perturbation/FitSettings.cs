using ExprModel.Core.Analysis;

namespace ExprModel.Core.Perturbation;

/// <summary>Settings of a density fit (DOMAIN.md, "Fitting under an expression prior").</summary>
public sealed record FitSettings
{
    /// <summary>
    /// Width of the Gaussian prior in ln(relative density); null = no prior. Default ln 2: a two-fold departure from the
    /// expression-derived density costs as much as one scale of misfit (our default: mRNA predicts channel density only
    /// modestly).
    /// </summary>
    public double? PriorWidth { get; init; } = Math.Log(2);
    public int Starts { get; init; } = 3;
    public int Seed { get; init; } = 1;
    public FitOptimiser Optimiser { get; init; } = FitOptimiser.LevenbergMarquardt;
    /// <summary>Model evaluations allowed per start (each is one run of the feature extractor).</summary>
    public int MaxEvaluationsPerStart { get; init; } = 400;
    /// <summary>Finite-difference step in ln(density) for the Levenberg-Marquardt Jacobian: ln 1.1 (10 %), twenty 0.5 % rheobase grid steps.</summary>
    public double JacobianStepLn { get; init; } = Math.Log(1.1);
    /// <summary>Spread (ln units) of the random starting points around the model; start 1 is the model itself.</summary>
    public double StartSpreadLn { get; init; } = 0.4;
    /// <summary>Read-out settings for every evaluation: the rheobase and onset grids tightened as for the sensitivity matrix.</summary>
    public ReadoutSettings Readouts { get; init; } = SensitivitySettings.TightReadouts;
    /// <summary>Channels (labels as in the model) held at their density.</summary>
    public IReadOnlySet<string> FixedChannels { get; init; } = new HashSet<string>();
    /// <summary>Largest fold change either way when the catalog's plausible range gives no bound (a minimum of 0).</summary>
    public double MaxFoldChange { get; init; } = 20;
    /// <summary>A direction counts as pinned down when the data alone fix it to within this many ln units (ln 1.5) per scale of misfit.</summary>
    public double PinnedWithinLn { get; init; } = Math.Log(1.5);

    public static FitSettings Default { get; } = new();

    public string? Problem()
    {
        if (PriorWidth is { } w && !(w > 0 && double.IsFinite(w))) return $"priorWidth must be a positive number (got {w})";
        if (Starts is < 1 or > 100) return $"starts must be 1 to 100 (got {Starts})";
        if (MaxEvaluationsPerStart is < 10 or > 100_000) return $"maxEvaluationsPerStart must be 10 to 100000 (got {MaxEvaluationsPerStart})";
        if (!(JacobianStepLn is > 0 and <= 1)) return $"jacobianStepLn must lie in (0, 1] (got {JacobianStepLn})";
        if (!(MaxFoldChange > 1)) return "maxFoldChange must be above 1";
        return null;
    }
}
