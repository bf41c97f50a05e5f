using System.Text;

namespace ExprModel.Core.Expression.Text;

/// <summary>
/// Reads delimited records (RFC 4180: fields may be quoted, quotes doubled inside quotes, line breaks allowed inside
/// quotes) one at a time into a reused buffer, so a table of any length is read in memory bounded by its longest
/// record. Every error names the file, line and column. Blank lines are skipped.
/// </summary>
internal sealed class RecordReader : IDisposable
{
    private readonly TextReader _reader;
    private readonly char[] _chunk = new char[1 << 16];
    private int _chunkPos, _chunkLen;
    private bool _eof;

    private char[] _record = new char[1 << 12];
    private int _recordLen;
    private int[] _starts = new int[256];
    private int[] _lengths = new int[256];

    private long _line = 1;           // physical line of the next character
    private int _physicalColumn = 1;  // character column of the next character, for errors inside a field

    public string FileName { get; }
    public char Delimiter { get; set; }
    /// <summary>Fields separated by any run of spaces or tabs, leading blanks ignored (Matrix Market bodies); no quoting.</summary>
    public bool WhitespaceDelimited { get; init; }
    public int MaxRecordChars { get; }
    public int MaxColumns { get; }

    /// <summary>Physical line on which the current record starts (1-based).</summary>
    public long LineNumber { get; private set; }
    public int FieldCount { get; private set; }

    public RecordReader(Stream stream, string fileName, char delimiter, int maxRecordChars, int maxColumns)
    {
        // Strict UTF-8: invalid bytes are a format error (binary data), not silently replaced characters.
        _reader = new StreamReader(stream, new UTF8Encoding(false, throwOnInvalidBytes: true), detectEncodingFromByteOrderMarks: true, 1 << 16);
        FileName = fileName;
        Delimiter = delimiter;
        MaxRecordChars = maxRecordChars;
        MaxColumns = maxColumns;
    }

    public ReadOnlySpan<char> Field(int i) => _record.AsSpan(_starts[i], _lengths[i]);
    public string FieldString(int i) => new(Field(i));

    public ExpressionFormatException Error(int column, string what) =>
        new($"{FileName}: line {LineNumber}, column {column}: {what}");

    private ExpressionFormatException ErrorHere(string what) =>
        new($"{FileName}: line {_line}, character {_physicalColumn}: {what}");

    private int Peek()
    {
        if (_chunkPos < _chunkLen) return _chunk[_chunkPos];
        if (_eof) return -1;
        try { _chunkLen = _reader.Read(_chunk, 0, _chunk.Length); }
        catch (DecoderFallbackException)
        {
            throw ErrorHere("not UTF-8 text (invalid byte sequence): binary data or a different encoding; save the table as UTF-8 text.");
        }
        _chunkPos = 0;
        if (_chunkLen == 0) { _eof = true; return -1; }
        return _chunk[0];
    }

    private void Advance()
    {
        char c = _chunk[_chunkPos++];
        if (c == '\n') { _line++; _physicalColumn = 1; }
        else _physicalColumn++;
    }

    private void Append(char c)
    {
        if (_recordLen == _record.Length)
        {
            if (_record.Length >= MaxRecordChars)
                throw new ExpressionFormatException($"{FileName}: line {LineNumber}: record longer than {MaxRecordChars:N0} characters (binary data, " +
                    "a missing line break, or raise the limit).");
            Array.Resize(ref _record, (int)Math.Min((long)_record.Length * 2, MaxRecordChars));
        }
        _record[_recordLen++] = c;
    }

    private void EndField(int start)
    {
        if (FieldCount == MaxColumns)
            throw new ExpressionFormatException($"{FileName}: line {LineNumber}, column {MaxColumns + 1}: " +
                $"more than {MaxColumns:N0} columns (raise the limit if this is intended).");
        if (FieldCount == _starts.Length)
        {
            Array.Resize(ref _starts, _starts.Length * 2);
            Array.Resize(ref _lengths, _lengths.Length * 2);
        }
        _starts[FieldCount] = start;
        _lengths[FieldCount] = _recordLen - start;
        FieldCount++;
    }

    /// <summary>Reads the next non-blank record; false at end of input.</summary>
    public bool ReadRecord()
    {
        while (true)
        {
            if (Peek() < 0) return false;
            if (ReadOne()) return true;
        }
    }

    /// <summary>Reads one record; false if it was a blank line.</summary>
    private bool ReadOne()
    {
        _recordLen = 0;
        FieldCount = 0;
        LineNumber = _line;
        bool anyContent = false;
        if (WhitespaceDelimited) return ReadWhitespaceRecord();
        while (true)
        {
            int start = _recordLen;
            int c = Peek();
            if (c == '"')
            {
                anyContent = true;
                long quoteLine = _line;
                int quoteCol = _physicalColumn;
                Advance();
                while (true)
                {
                    c = Peek();
                    if (c < 0)
                        throw new ExpressionFormatException($"{FileName}: line {quoteLine}, column {FieldCount + 1}: " +
                            $"quote opened at character {quoteCol} is never closed.");
                    Advance();
                    if (c == '"')
                    {
                        if (Peek() == '"') { Advance(); Append('"'); continue; }
                        break;
                    }
                    if (c == 0) throw ErrorHere("NUL character: binary data, not a text table.");
                    Append((char)c);
                }
                c = Peek();
                if (c >= 0 && c != Delimiter && c != '\n' && c != '\r')
                    throw ErrorHere($"unexpected character '{(char)c}' after a closing quote (column {FieldCount + 1}).");
            }
            else
            {
                while (true)
                {
                    c = Peek();
                    if (c < 0 || c == Delimiter || c == '\n' || c == '\r') break;
                    if (c == '"') throw ErrorHere($"quote inside an unquoted field (column {FieldCount + 1}); quote the whole field and double inner quotes.");
                    if (c == 0) throw ErrorHere("NUL character: binary data, not a text table.");
                    Advance();
                    Append((char)c);
                    anyContent = true;
                }
            }
            EndField(start);
            c = Peek();
            if (c == Delimiter) { Advance(); anyContent = true; continue; }
            if (c == '\r') { Advance(); if (Peek() == '\n') Advance(); }
            else if (c == '\n') Advance();
            return anyContent;
        }
    }

    private bool ReadWhitespaceRecord()
    {
        while (true)
        {
            int c = Peek();
            while (c is ' ' or '\t') { Advance(); c = Peek(); }
            if (c < 0 || c == '\n' || c == '\r')
            {
                if (c == '\r') { Advance(); if (Peek() == '\n') Advance(); }
                else if (c == '\n') Advance();
                return FieldCount > 0;
            }
            int start = _recordLen;
            while (c >= 0 && c is not (' ' or '\t' or '\n' or '\r'))
            {
                if (c == 0) throw ErrorHere("NUL character: binary data, not a text table.");
                Advance();
                Append((char)c);
                c = Peek();
            }
            EndField(start);
        }
    }

    public void Dispose() => _reader.Dispose();
}
