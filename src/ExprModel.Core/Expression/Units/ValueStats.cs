namespace ExprModel.Core.Expression.Units;

/// <summary>What the reader saw in the values while streaming: enough to detect the unit without holding the matrix.</summary>
internal sealed class ValueStats
{
    public bool AllWhole { get; private set; } = true;
    public double Max { get; private set; }
    public long Count { get; private set; }
    public long Nonzero { get; private set; }
    /// <summary>The table's delimiter is not the comma, so a comma inside a value can be a decimal separator.</summary>
    public bool DecimalCommaAllowed { get; init; }
    /// <summary>Values read with a decimal comma (first one's place kept for the note).</summary>
    public long DecimalCommas { get; set; }
    public string? FirstDecimalComma { get; set; }
    /// <summary>Undone log values carry rounding error, so a looser whole-number test is used for them.</summary>
    public double WholeTolerance { get; init; }

    public void Add(double v)
    {
        Count++;
        if (v == 0) return;
        Nonzero++;
        if (v > Max) Max = v;
        if (AllWhole && Math.Abs(v - Math.Round(v)) > WholeTolerance * Math.Max(1, v)) AllWhole = false;
    }
}
