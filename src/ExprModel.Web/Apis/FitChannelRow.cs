using ExprModel.Core.Perturbation;

namespace ExprModel.Web.Apis;

/// <summary>One channel of a fit; <see cref="DataSdLn"/> is null when the data leave it free altogether (or it was fixed).</summary>
public sealed record FitChannelRow(string Channel, double StartRelative, double FittedRelative, double FoldChange, bool Fixed, bool Pinned,
    double? DataSdLn, bool AtBound)
{
    public static FitChannelRow From(FitChannel c) =>
        new(c.Channel, c.StartRelative, c.FittedRelative, c.FoldChange, c.Fixed, c.Pinned, double.IsFinite(c.DataSdLn) ? c.DataSdLn : null, c.AtBound);
}
