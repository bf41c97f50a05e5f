using ExprModel.Core.Models;
using ExprModel.Core.Stochastic;

namespace ExprModel.Web.Apis;

/// <summary>A patch simulation's records (pA, ms), dwell histograms with theory, open probabilities, noise fit and the caution.</summary>
public sealed record PatchResponse(
    string Entry,
    double UnitaryConductancePs,
    string UnitaryConductanceBasis,
    string UnitaryConductanceCitation,
    double ReversalMv,
    double UnitaryCurrentAtStepPa,
    double[] TimesMs,
    double[] CommandMv,
    IReadOnlyList<double[]> SweepsPa,
    double[] MeanPa,
    double[] VariancePa2,
    double[] StandardErrorPa,
    double[] DeterministicPa,
    double MeasuredOpenProbability,
    double StationaryOpenProbability,
    double MeanOpenTheoryMs,
    double? MeanOpenMs,
    double? MeanClosedMs,
    DwellHistogram OpenDwells,
    DwellHistogram ClosedDwells,
    double? FittedUnitaryCurrentPa,
    double? FittedChannelCount,
    string Caution)
{
    public static PatchResponse From(PatchResult r, UnitaryConductance unitary)
    {
        bool own = r.Settings.UnitaryConductancePs == unitary.ConductancePs;
        return new PatchResponse(r.Settings.Entry.Key, r.Settings.UnitaryConductancePs, own ? unitary.BasisLabel : "given in the request",
            own ? unitary.Citation : "", r.ReversalMv, r.UnitaryCurrentAtStepPa, r.TimesMs, r.CommandMv, r.SweepCurrentsPa, r.MeanCurrentPa,
            r.VarianceCurrentPa2, r.StandardErrorPa, r.DeterministicCurrentPa, r.MeasuredOpenProbability, r.StationaryOpenProbability,
            r.DwellTheory.MeanOpenMs, r.OpenDwellsMs.Count > 0 ? r.OpenDwellsMs.Average() : null,
            r.ClosedDwellsMs.Count > 0 ? r.ClosedDwellsMs.Average() : null, DwellHistogram.From(r.OpenDwellsMs, r.DwellTheory.OpenDensity),
            DwellHistogram.From(r.ClosedDwellsMs, r.DwellTheory.ClosedDensity), r.NoiseFit?.UnitaryCurrentPa, r.NoiseFit?.ChannelCount,
            ResearchCaution.Text);
    }
}
