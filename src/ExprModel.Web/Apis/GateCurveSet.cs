namespace ExprModel.Web.Apis;

public sealed record GateCurveSet(string Gate, int Power, double[] VoltageMv, double[] SteadyState, double[] TimeConstantMs);
