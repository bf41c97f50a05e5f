namespace ExprModel.Core.Simulation;

/// <summary>A waveform text that cannot be read; the message names the source, line and column.</summary>
public sealed class WaveformFormatException(string message) : Exception(message);
