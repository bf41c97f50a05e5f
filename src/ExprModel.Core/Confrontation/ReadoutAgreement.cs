namespace ExprModel.Core.Confrontation;

/// <summary>Agreement of predicted and recorded values of one read-out across cells.</summary>
/// <param name="Cells">Pairs with both values.</param>
/// <param name="PearsonR">Linear correlation; null with fewer than 3 pairs or no spread.</param>
/// <param name="SpearmanR">Rank correlation; null likewise.</param>
/// <param name="MeanAbsoluteError">Mean of |predicted - recorded|.</param>
/// <param name="Bias">Mean of predicted - recorded.</param>
public sealed record ReadoutAgreement(string Readout, string Unit, int Cells, double? PearsonR, double? SpearmanR, double? MeanAbsoluteError, double? Bias);
