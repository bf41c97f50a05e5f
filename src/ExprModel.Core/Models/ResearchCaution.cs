namespace ExprModel.Core.Models;

/// <summary>The research-use caution shown with every prediction and written into every export.</summary>
public static class ResearchCaution
{
    public const string Text =
        "Research tool. Predictions are hypotheses about a simplified single-compartment cell from mRNA, not measurements, " +
        "and are not for clinical or diagnostic use (for example, judging a patient's channel variant).";
}
