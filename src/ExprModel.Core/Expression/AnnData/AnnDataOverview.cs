namespace ExprModel.Core.Expression.AnnData;

/// <summary>
/// What an AnnData file offers before it is read for real (<see cref="AnnDataReader.Describe"/>): its size, every
/// matrix a user can pick (X, each layer, raw/X) and, when X's first values look log-transformed and another matrix
/// holds whole numbers, the same hint the reader gives when it refuses X (<see cref="Hint"/>) with that matrix
/// (<see cref="Suggested"/>).
/// </summary>
/// <param name="File">The file name, as messages name it.</param>
/// <param name="Cells">Rows of the obs index.</param>
/// <param name="Genes">Rows of the var index (the genes of X and the layers).</param>
public sealed record AnnDataOverview(string File, int Cells, int Genes, IReadOnlyList<AnnDataMatrixSummary> Matrices, string? Hint,
    MatrixChoice? Suggested);
