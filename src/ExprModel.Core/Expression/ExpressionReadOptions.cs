using ExprModel.Core.Expression.AnnData;

namespace ExprModel.Core.Expression;

/// <summary>How to read an expression file. Everything is optional; whatever is detected instead is reported in the table's notes.</summary>
public sealed record ExpressionReadOptions
{
    /// <summary>Genes to keep (by identifier as written in the file). Null keeps every gene. Library sizes always cover all genes.</summary>
    public Func<string, bool>? KeepGene { get; init; }

    /// <summary>Which axis holds genes; null detects it (delimited text only; other formats have a fixed layout).</summary>
    public TableOrientation? Orientation { get; init; }

    /// <summary>The unit of the values (after undoing <see cref="LogTransform"/>); null detects it from the values.</summary>
    public ExpressionUnit? Unit { get; init; }

    /// <summary>A log transform to undo on every value before anything else (library sizes are then sums of the undone values).</summary>
    public LogTransform LogTransform { get; init; } = LogTransform.None;

    public DuplicateGenePolicy DuplicateGenes { get; init; } = DuplicateGenePolicy.Error;

    /// <summary>For Matrix Market feature sidecars: 1-based column holding the gene identifier to use (1 = Ensembl id, 2 = symbol). Null uses column 2 when
    /// present.</summary>
    public int? FeatureColumn { get; init; }

    /// <summary>For AnnData files: the var column holding the gene identifiers to use (e.g. symbols when the index holds Ensembl ids). Null uses the var
    /// index.</summary>
    public string? GeneColumn { get; init; }

    /// <summary>For AnnData files: the matrix to read (X, a layer or raw/X). Null reads X and, when X looks log-transformed, the error names a
    /// layer or raw/X holding whole numbers.</summary>
    public MatrixChoice? Matrix { get; init; }

    /// <summary>
    /// Read only these cells (by position in the file's cell order); null reads every cell. The result holds the range's cells with the values
    /// and library sizes a full read gives them; the unit is decided from the range's values (state it so every part of an atlas run agrees).
    /// </summary>
    public CellRange? Cells { get; init; }

    /// <summary>Counts bytes and values the read touched (null: not counted).</summary>
    public ReadMeter? Meter { get; init; }

    /// <summary>Guard against decompression bombs: the most bytes a compressed input may inflate to.</summary>
    public long MaxDecompressedBytes { get; init; } = 32L << 30;

    /// <summary>Guard against runaway lines (binary data, a missing newline): the longest record in characters.</summary>
    public int MaxRecordChars { get; init; } = 32 << 20;

    /// <summary>The most fields a record may have (cells or genes plus the identifier column).</summary>
    public int MaxColumns { get; init; } = 500_000;

    /// <summary>Guard against inputs of endless (often blank) lines: the most physical lines a text file may have, blank lines included.</summary>
    public long MaxLines { get; init; } = long.MaxValue;

    /// <summary>Stops reading (<see cref="OperationCanceledException"/>) when cancelled, e.g. when the client of a server request has gone.</summary>
    public CancellationToken Cancel { get; init; }

    public static ExpressionReadOptions Default { get; } = new();
}
