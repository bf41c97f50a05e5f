namespace ExprModel.Web.Components.Panels;

/// <summary>
/// The relative-density slider's logarithmic scale: position 0 is "off" (0%), positions 1..<see cref="Positions"/>
/// span 1% to 400% logarithmically, so 100% ("as expressed") sits about three quarters of the way along.
/// </summary>
public static class DensityScale
{
    public const int Positions = 1000;
    public const double LowestOn = 0.01;
    public const double Highest = 4.0;

    public static double RelativeAt(int position)
    {
        if (position <= 0) return 0;
        position = Math.Min(position, Positions);
        return LowestOn * Math.Pow(Highest / LowestOn, (position - 1) / (double)(Positions - 1));
    }

    public static int PositionOf(double relative)
    {
        if (!(relative > 0)) return 0;
        if (relative <= LowestOn) return 1;
        if (relative >= Highest) return Positions;
        return (int)Math.Round(1 + (Positions - 1) * Math.Log(relative / LowestOn) / Math.Log(Highest / LowestOn));
    }
}
