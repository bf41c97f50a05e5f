namespace ExprModel.Web.Apis;

public sealed record SimulateResponse(double[] TimeMs, double[] VoltageMv, double[] StimulusUaPerCm2, IReadOnlyList<double> SpikeTimesMs, string Caution);
