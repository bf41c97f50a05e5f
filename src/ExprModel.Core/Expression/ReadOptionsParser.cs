using ExprModel.Core.Expression.AnnData;

namespace ExprModel.Core.Expression;

/// <summary>
/// The one reading of the words a user types for how a table is written (orientation, unit, log transform), shared
/// by the command line, the HTTP API and the Load page so that each accepts the same spellings and refuses the rest
/// with the same message. Spellings are matched ignoring case and surrounding blanks; an absent or empty value means
/// "detect". Errors are <see cref="ArgumentException"/>s that start with the field's name as the caller spells it.
/// </summary>
public static class ReadOptionsParser
{
    /// <summary>The read options a user stated; <paramref name="fieldPrefix"/> goes before each field name in messages ("--" on the command line).</summary>
    /// <exception cref="ArgumentException">A value is not one of the accepted spellings (the message names the field and the choices).</exception>
    public static ExpressionReadOptions Parse(string? orientation, string? unit, string? log = null, string fieldPrefix = "", string? matrix = null)
    {
        var (statedUnit, unitLog) = Unit(unit, fieldPrefix + "unit");
        var statedLog = Log(log, fieldPrefix + "log");
        return new ExpressionReadOptions
        {
            Orientation = Orientation(orientation, fieldPrefix + "orientation"),
            Unit = statedUnit,
            LogTransform = statedLog != LogTransform.None ? statedLog : unitLog,
            Matrix = Matrix(matrix, fieldPrefix + "matrix"),
        };
    }

    public static TableOrientation? Orientation(string? text, string field = "orientation") => Word(text) switch
    {
        null => null,
        "genes-as-rows" => TableOrientation.GenesAsRows,
        "cells-as-rows" => TableOrientation.CellsAsRows,
        _ => throw new ArgumentException($"{field}: '{text}' is not genes-as-rows or cells-as-rows."),
    };

    /// <summary>
    /// The unit, and the log transform that "log-transformed" implies: ln(1 + x), the common default of single-cell
    /// toolkits (common practice); another transform is stated with <see cref="Log"/>. The other units imply none.
    /// </summary>
    public static (ExpressionUnit? Unit, LogTransform Log) Unit(string? text, string field = "unit") => Word(text) switch
    {
        null => (null, LogTransform.None),
        "counts" or "count" or "raw" => (ExpressionUnit.Counts, LogTransform.None),
        "cpm" => (ExpressionUnit.Cpm, LogTransform.None),
        "tpm" => (ExpressionUnit.Tpm, LogTransform.None),
        "fpkm" or "rpkm" => (ExpressionUnit.Fpkm, LogTransform.None),
        "log-transformed" => (null, LogTransform.NaturalLog1p),
        _ => throw new ArgumentException($"{field}: '{text}' is not counts, cpm, tpm, fpkm or log-transformed."),
    };

    public static LogTransform Log(string? text, string field = "log") => Word(text) switch
    {
        null => LogTransform.None,
        "ln1p" => LogTransform.NaturalLog1p,
        "log2p1" => LogTransform.Log2Plus1,
        "log10p1" => LogTransform.Log10Plus1,
        _ => throw new ArgumentException($"{field}: '{text}' is not ln1p, log2p1 or log10p1."),
    };

    /// <summary>
    /// The AnnData matrix to read: <c>X</c>, <c>layer:NAME</c> (a matrix under layers/) or <c>raw</c> (raw/X with raw/var); null or blank means X
    /// with the log-transform hint. The words X, layers and raw are the AnnData format's own names.
    /// </summary>
    public static MatrixChoice? Matrix(string? text, string field = "matrix")
    {
        if (string.IsNullOrWhiteSpace(text)) return null;
        string t = text.Trim();
        if (t.Equals("X", StringComparison.OrdinalIgnoreCase)) return MatrixChoice.X;
        if (t.Equals("raw", StringComparison.OrdinalIgnoreCase) || t.Equals("raw/X", StringComparison.OrdinalIgnoreCase)) return MatrixChoice.Raw;
        foreach (var prefix in new[] { "layer:", "layers/" })
            if (t.StartsWith(prefix, StringComparison.OrdinalIgnoreCase))
            {
                string name = t[prefix.Length..];
                if (name.Length > 0 && !name.Contains('/') && name.Trim() == name) return MatrixChoice.Layer(name);
            }
        throw new ArgumentException($"{field}: '{text}' is not X, layer:NAME (a matrix under layers/) or raw (raw/X).");
    }

    private static string? Word(string? text) => string.IsNullOrWhiteSpace(text) ? null : text.Trim().ToLowerInvariant();
}
