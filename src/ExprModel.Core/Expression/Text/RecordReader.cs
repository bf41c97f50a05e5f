using System.Buffers;
using System.Text.Unicode;

namespace ExprModel.Core.Expression.Text;

/// <summary>
/// Reads delimited records (RFC 4180: fields may be quoted, quotes doubled inside quotes, line breaks allowed inside
/// quotes) one at a time into a reused buffer, so a table of any length is read in memory bounded by its longest
/// record. Every error names the file, line and column. Blank lines are skipped.
/// </summary>
internal sealed class RecordReader : IDisposable
{
    private readonly Stream _stream;
    private readonly byte[] _bytes = new byte[1 << 16];
    private int _bytePos, _byteLen;
    private bool _streamDone, _started;
    /// <summary>The invalid byte that ends the decoded characters, refused when the reader reaches it; -1 when none.</summary>
    private int _invalidByte = -1;
    private readonly char[] _chunk = new char[1 << 16];
    private int _chunkPos, _chunkLen;
    private bool _eof, _inRecord;

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

    /// <summary>The most physical lines the input may have, blank lines included.</summary>
    public long MaxLines { get; }
    private readonly CancellationToken _cancel;

    /// <param name="maxLines">Stops with <see cref="ExpressionLimitException"/> past this many physical lines (blank lines count).</param>
    /// <param name="cancel">Checked before every block of input is decoded (64 K characters).</param>
    public RecordReader(Stream stream, string fileName, char delimiter, int maxRecordChars, int maxColumns, long maxLines = long.MaxValue,
        CancellationToken cancel = default)
    {
        // Strict UTF-8, decoded here block by block: the characters before an invalid byte are read as usual and the byte is
        // refused where it stands, so the error names its own line and character (a decoder that throws for the whole block
        // loses the position).
        _stream = stream;
        FileName = fileName;
        Delimiter = delimiter;
        MaxRecordChars = maxRecordChars;
        MaxColumns = maxColumns;
        MaxLines = maxLines;
        _cancel = cancel;
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
        Decode();
        if (_chunkLen == 0) { _eof = true; return -1; }
        return _chunk[0];
    }

    /// <summary>Decodes the next block of characters into the chunk (empty at the end of input).</summary>
    private void Decode()
    {
        _cancel.ThrowIfCancellationRequested();
        if (_invalidByte >= 0)
            throw ErrorHere($"byte 0x{_invalidByte:X2} (column {(_inRecord ? FieldCount + 1 : 1)}) is not UTF-8 text (invalid byte sequence): binary data "
                + "or a different encoding; save the table as UTF-8 text.");
        _chunkPos = 0;
        _chunkLen = 0;
        while (true)
        {
            if (!_streamDone && (_byteLen - _bytePos < 4 || !_started)) Fill();
            if (!_started && !StartOfText()) continue;
            var status = Utf8.ToUtf16(_bytes.AsSpan(_bytePos, _byteLen - _bytePos), _chunk, out int read, out int written,
                replaceInvalidSequences: false, isFinalBlock: _streamDone);
            _bytePos += read;
            _chunkLen = written;
            if (status == OperationStatus.InvalidData)
            {
                _invalidByte = _bytes[_bytePos];
                if (written == 0) Decode(); // throws, at the current position
                return;
            }
            if (written > 0 || _streamDone) return;
        }
    }

    /// <summary>Tops the byte buffer up after what is left of it (at most a partial UTF-8 sequence, fewer than 4 bytes, or nothing).</summary>
    private void Fill()
    {
        int left = _byteLen - _bytePos;
        Array.Copy(_bytes, _bytePos, _bytes, 0, left);
        (_bytePos, _byteLen) = (0, left);
        while (_byteLen < _bytes.Length)
        {
            int n = _stream.Read(_bytes, _byteLen, _bytes.Length - _byteLen);
            if (n == 0) { _streamDone = true; break; }
            _byteLen += n;
            if (_byteLen >= 4) break; // enough to go on; a slow stream is not waited on for a whole buffer
        }
    }

    /// <summary>
    /// Skips a UTF-8 byte-order mark and refuses UTF-16 or UTF-32 text by its mark; false while too few bytes have arrived to tell.
    /// </summary>
    private bool StartOfText()
    {
        var head = _bytes.AsSpan(_bytePos, _byteLen - _bytePos);
        if (head.Length < 3 && !_streamDone) return false;
        _started = true;
        if (head.StartsWith((ReadOnlySpan<byte>)[0xEF, 0xBB, 0xBF])) _bytePos += 3;
        else if (head.StartsWith((ReadOnlySpan<byte>)[0xFF, 0xFE]) || head.StartsWith((ReadOnlySpan<byte>)[0xFE, 0xFF]))
            throw ErrorHere("UTF-16 text (its byte-order mark): save the table as UTF-8 text.");
        return true;
    }

    private void Advance()
    {
        char c = _chunk[_chunkPos++];
        if (c == '\n')
        {
            if (_line == MaxLines)
                throw new ExpressionLimitException($"{FileName}: line {_line + 1:N0}: more than {MaxLines:N0} lines (blank lines count), the limit for "
                    + "one table; reading stopped there.");
            _line++;
            _physicalColumn = 1;
        }
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

    /// <summary>
    /// Moves past the next non-blank record without keeping its fields (quotes respected, so a line break inside quotes
    /// stays inside the record; no field is checked); false at end of input. Used to stream past other cells' rows.
    /// </summary>
    public bool SkipRecord()
    {
        while (true)
        {
            int c = Peek();
            if (c < 0) return false;
            if (c is '\n' or '\r') { Advance(); continue; } // blank line
            LineNumber = _line;
            FieldCount = 0;
            bool quoted = false;
            while (true)
            {
                c = Peek();
                if (c < 0)
                {
                    if (quoted) throw new ExpressionFormatException($"{FileName}: line {LineNumber}: a quote opened in this record is never closed.");
                    return true;
                }
                Advance();
                if (c == '"' && !WhitespaceDelimited) quoted = !quoted;
                else if (!quoted && c is '\n' or '\r')
                {
                    if (c == '\r' && Peek() == '\n') Advance();
                    return true;
                }
            }
        }
    }

    /// <summary>Reads one record; false if it was a blank line.</summary>
    private bool ReadOne()
    {
        _recordLen = 0;
        FieldCount = 0;
        LineNumber = _line;
        _inRecord = true;
        try { return ReadFields(); }
        finally { _inRecord = false; }
    }

    private bool ReadFields()
    {
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

    public void Dispose() => _stream.Dispose();
}
