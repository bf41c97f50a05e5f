using System.Globalization;

namespace ExprModel.Core.Expression.Text;

/// <summary>Parses one expression value, refusing what a matrix of expression levels cannot hold.</summary>
internal static class ValueParser
{
    /// <summary>
    /// Null when the value is fine; otherwise what is wrong with it. With <paramref name="decimalComma"/> (a table whose
    /// delimiter is not the comma, as spreadsheets write in decimal-comma locales) one comma in a value without a point
    /// is its decimal separator, and <paramref name="usedComma"/> says so.
    /// </summary>
    public static string? TryParse(ReadOnlySpan<char> text, out double value, bool decimalComma, out bool usedComma)
    {
        usedComma = false;
        int comma = decimalComma ? text.IndexOf(',') : -1;
        if (comma < 0) return TryParse(text, out value);
        if (text.IndexOf('.') >= 0 || text[(comma + 1)..].IndexOf(',') >= 0)
        {
            value = 0;
            return $"'{Shorten(text.Trim())}' mixes thousands and decimal separators (write the value without grouping, e.g. 1234,5)";
        }
        Span<char> copy = text.Length <= 64 ? stackalloc char[text.Length] : new char[text.Length];
        text.CopyTo(copy);
        copy[comma] = '.';
        usedComma = true;
        return TryParse(copy, out value);
    }

    /// <summary>Null when the value is fine; otherwise what is wrong with it.</summary>
    public static string? TryParse(ReadOnlySpan<char> text, out double value)
    {
        value = 0;
        // Fast path for plain whole numbers, which is what count tables hold almost everywhere.
        if (text.Length is > 0 and <= 15)
        {
            long n = 0;
            int i = 0;
            for (; i < text.Length; i++)
            {
                int d = text[i] - '0';
                if ((uint)d > 9) break;
                n = n * 10 + d;
            }
            if (i == text.Length) { value = n; return null; }
        }
        var t = text.Trim();
        if (t.IsEmpty) return "empty value (missing values are not allowed; write 0 for no expression)";
        if (!double.TryParse(t, NumberStyles.Float, CultureInfo.InvariantCulture, out value))
            return $"'{Shorten(t)}' is not a number";
        if (double.IsNaN(value)) return "NaN is not an expression level";
        if (double.IsInfinity(value)) return $"'{Shorten(t)}' is infinite (or too large for a double)";
        if (value < 0) return $"negative value {Shorten(t)} (expression levels are >= 0; log-ratios and scaled values cannot be read)";
        return null;
    }

    public static string Shorten(ReadOnlySpan<char> s) => s.Length <= 40 ? new string(s) : string.Concat(s[..37], "...");

    public static double Undo(double v, LogTransform transform) => transform switch
    {
        LogTransform.NaturalLog1p => Math.Exp(v) - 1,
        LogTransform.Log2Plus1 => Math.Pow(2, v) - 1,
        LogTransform.Log10Plus1 => Math.Pow(10, v) - 1,
        _ => v,
    };
}
