namespace ExprModel.Web.Simulation;

/// <summary>One point of an f-I curve as the plots, CSV and API carry it.</summary>
public sealed record FiRow(double CurrentUaPerCm2, int SpikesInStep, double WholeStepRateHz, double FirstIsiRateHz, double LateRateHz);
