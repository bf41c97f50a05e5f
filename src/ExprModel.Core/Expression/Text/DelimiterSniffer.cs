namespace ExprModel.Core.Expression.Text;

/// <summary>Finds the delimiter of a text table (comma, tab or semicolon) from its first line.</summary>
internal static class DelimiterSniffer
{
    private static readonly (char Char, string Name)[] Delimiters = [(',', "comma"), ('\t', "tab"), (';', "semicolon")];

    /// <summary>Counts candidate delimiters outside quotes on the first line; the most frequent wins.</summary>
    public static (char Delimiter, string Name) Detect(string path, string file, long maxDecompressedBytes)
    {
        using var stream = InputFile.Open(path, maxDecompressedBytes);
        using var reader = new StreamReader(stream, detectEncodingFromByteOrderMarks: true);
        var buffer = new char[1 << 20];
        int len;
        try { len = reader.ReadBlock(buffer, 0, buffer.Length); }
        catch (System.Text.DecoderFallbackException) { len = 0; }
        if (len == 0) throw new ExpressionFormatException($"{file}: line 1: the file is empty.");
        var counts = new int[Delimiters.Length];
        bool inQuotes = false;
        for (int i = 0; i < len; i++)
        {
            char c = buffer[i];
            if (c == '"') inQuotes = !inQuotes;
            else if (!inQuotes && (c == '\n' || c == '\r')) break;
            else if (!inQuotes)
                for (int d = 0; d < Delimiters.Length; d++) if (c == Delimiters[d].Char) counts[d]++;
        }
        int best = 0;
        for (int d = 1; d < counts.Length; d++) if (counts[d] > counts[best]) best = d;
        if (counts[best] == 0)
        {
            if (Array.IndexOf(buffer, '\0', 0, len) >= 0)
                throw new ExpressionFormatException($"{file}: line 1, column 1: NUL character: binary data, not a text table.");
            throw new ExpressionFormatException(
                $"{file}: line 1: no comma, tab or semicolon in the header; " +
                    "a table needs an identifier column and value columns separated by one of these (spaces, '|' and other delimiters are not read).");
        }
        return Delimiters[best];
    }
}
