namespace ExprModel.Core.Expression.Units;

/// <summary>
/// Decides the unit of a table: the user's statement when given (checked against the values, with warnings), or a
/// detection from the values with a note saying what was seen. Log-looking values without a stated transform are
/// refused: undoing the wrong transform would silently distort every density.
/// </summary>
internal static class UnitDecision
{
    /// <summary>
    /// Largest value a log-scale table plausibly holds: log2(1 + 1e6 CPM) is about 20, so non-whole tables whose
    /// maximum is at most 25 are taken as log-scale (common practice, from memory).
    /// </summary>
    public const double LogScaleMax = 25;

    /// <summary>Relative tolerance for "this cell sums to one million" (CPM/TPM); allows rounding in exported tables.</summary>
    public const double MillionTolerance = 0.01;

    /// <summary>True when <see cref="Decide"/> would refuse the values as log-transformed (no unit or transform stated, not whole, small).</summary>
    public static bool LooksLogTransformed(ExpressionReadOptions o, ValueStats s) =>
        o.Unit is null && o.LogTransform == LogTransform.None && s.Count > 0 && !s.AllWhole && s.Max <= LogScaleMax;

    public static (ExpressionUnit Unit, string Note) Decide(string file, ExpressionReadOptions o, ValueStats s, double[] librarySizes, List<string> notes)
    {
        if (s.Count == 0)
            throw new ExpressionFormatException($"{file}: no values: the table has no data cells.");
        string undone = o.LogTransform switch
        {
            LogTransform.NaturalLog1p => "undid ln(1 + x) as stated by the user; ",
            LogTransform.Log2Plus1 => "undid log2(1 + x) as stated by the user; ",
            LogTransform.Log10Plus1 => "undid log10(1 + x) as stated by the user; ",
            _ => "",
        };
        if (o.Unit == ExpressionUnit.LogTransformed && o.LogTransform == LogTransform.None)
            throw new ExpressionFormatException($"{file}: the unit is stated as log-transformed but not which transform; state ln(1 + x), log2(1 + x) " +
                "or log10(1 + x) so it can be undone.");

        bool sumsToMillion = SumsToMillion(librarySizes);
        if (o.Unit is { } given && given != ExpressionUnit.LogTransformed)
        {
            if (given == ExpressionUnit.Counts && !s.AllWhole)
                notes.Add($"unit stated as raw counts, but some values are not whole numbers (largest {s.Max:G6}); check the unit.");
            if (given is ExpressionUnit.Cpm or ExpressionUnit.Tpm && !sumsToMillion)
                notes.Add($"unit stated as {given.ToString().ToUpperInvariant()}, but cells do not sum to one million; " +
                    "the file may hold a subset of genes or another unit.");
            if (o.LogTransform == LogTransform.None && !s.AllWhole && s.Max <= LogScaleMax)
                notes.Add($"values are not whole numbers and the largest is {s.Max:G4}: they look log-transformed although the unit was stated as {given}.");
            return (given, $"{undone}{Describe(given)} (given by the user)");
        }

        if (s.AllWhole)
            return (ExpressionUnit.Counts, $"{undone}detected raw counts: every value is a whole number (largest {s.Max:G6}); " +
                "normalised to CPM by each cell's library size. State the unit if these are not counts.");
        if (o.LogTransform == LogTransform.None && s.Max <= LogScaleMax)
            throw new ExpressionFormatException(
                $"{file}: values look log-transformed (not whole numbers, largest {s.Max:G4}; linear tables reach hundreds or more). " +
                "Refusing to guess the transform: state it (ln(1 + x), log2(1 + x), log10(1 + x)) so it can be undone, " +
                    "or state the unit if the values are linear.");
        if (sumsToMillion)
            return (ExpressionUnit.Cpm,
                $"{undone}detected CPM or TPM: values are not whole numbers and every cell sums to one million (within {MillionTolerance:P0}); read as given.");
        if (CommonSum(librarySizes) is { } total)
            return (ExpressionUnit.Fpkm, $"{undone}values are not whole numbers and every cell sums to {total:G6}, not one million: " +
                "normalised to another total; read as given (FPKM-like, relative levels only). State the unit to be sure.");
        return (ExpressionUnit.Fpkm, $"{undone}detected FPKM/RPKM-like values: not whole numbers, largest {s.Max:G6}, and cells do not sum to one million; " +
            "read as given. State the unit to be sure.");
    }

    /// <summary>The total every non-empty cell sums to (within the same tolerance), or null.</summary>
    private static double? CommonSum(double[] librarySizes)
    {
        var nonzero = librarySizes.Where(l => l > 0).ToList();
        if (nonzero.Count < 2) return null;
        double first = nonzero[0];
        return nonzero.All(l => Math.Abs(l - first) <= MillionTolerance * first) ? first : null;
    }

    private static bool SumsToMillion(double[] librarySizes)
    {
        int n = 0, ok = 0;
        foreach (var l in librarySizes)
        {
            if (l == 0) continue;
            n++;
            if (Math.Abs(l - 1e6) <= MillionTolerance * 1e6) ok++;
        }
        return n > 0 && ok == n;
    }

    private static string Describe(ExpressionUnit u) => u switch
    {
        ExpressionUnit.Counts => "raw counts, normalised to CPM by library size",
        ExpressionUnit.Cpm => "CPM",
        ExpressionUnit.Tpm => "TPM",
        ExpressionUnit.Fpkm => "FPKM/RPKM",
        _ => u.ToString(),
    };
}
