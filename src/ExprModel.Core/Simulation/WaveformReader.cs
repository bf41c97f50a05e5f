using System.Globalization;

namespace ExprModel.Core.Simulation;

/// <summary>
/// Reads a current waveform from text: one sample per line, time (ms) then current, separated by a comma, semicolon
/// or tab; blank lines and '#' comments are skipped, and a first line whose time is not a number is taken as the
/// header. Times must increase. Errors name the source, line and column.
/// </summary>
public static class WaveformReader
{
    /// <summary>Most samples a waveform may hold.</summary>
    public const int MaxSamples = 1_000_000;

    /// <param name="source">Named in errors (the file name).</param>
    /// <param name="toDensity">Converts a current as written (in the user's unit) to uA/cm2.</param>
    /// <exception cref="WaveformFormatException">A line that is not two numbers, times that do not increase, or too few samples.</exception>
    public static WaveformCurrent Read(string text, string source, Func<double, double> toDensity)
    {
        var times = new List<double>();
        var values = new List<double>();
        int line = 0;
        bool seenData = false;
        using var reader = new StringReader(text);
        for (string? raw = reader.ReadLine(); raw is not null; raw = reader.ReadLine())
        {
            line++;
            var trimmed = raw.Trim();
            if (trimmed.Length == 0 || trimmed.StartsWith('#')) continue;
            var cols = trimmed.Split([',', ';', '\t']);
            if (!seenData && !double.TryParse(cols[0], NumberStyles.Float, CultureInfo.InvariantCulture, out _))
            {
                seenData = true; // the header
                continue;
            }
            seenData = true;
            if (cols.Length < 2) throw new WaveformFormatException($"{source}: line {line}: expected two columns (time_ms, current), found one.");
            if (!double.TryParse(cols[0].Trim(), NumberStyles.Float, CultureInfo.InvariantCulture, out var t) || !double.IsFinite(t))
                throw new WaveformFormatException($"{source}: line {line}, column 1: '{cols[0].Trim()}' is not a time in ms.");
            if (!double.TryParse(cols[1].Trim(), NumberStyles.Float, CultureInfo.InvariantCulture, out var v) || !double.IsFinite(v))
                throw new WaveformFormatException($"{source}: line {line}, column 2: '{cols[1].Trim()}' is not a current.");
            if (times.Count > 0 && t <= times[^1])
                throw new WaveformFormatException($"{source}: line {line}, column 1: times must increase ({t:R} ms follows {times[^1]:R} ms).");
            if (times.Count >= MaxSamples) throw new WaveformFormatException($"{source}: line {line}: more than {MaxSamples:N0} samples.");
            times.Add(t);
            values.Add(toDensity(v));
        }
        if (times.Count < 2) throw new WaveformFormatException($"{source}: needs at least two samples (time_ms, current), found {times.Count}.");
        return new WaveformCurrent(times, values);
    }
}
