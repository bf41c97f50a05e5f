namespace ExprModel.Core.Expression;

/// <summary>
/// What to do when one gene identifier names two or more rows (or columns) of the file. Duplicates are never merged:
/// a duplicated gene that is not kept (the filter rejects it) is only noted, since both copies still count towards
/// library size as written; a duplicated gene that is kept is an error unless the user chooses to keep the first copy.
/// </summary>
public enum DuplicateGenePolicy
{
    /// <summary>Refuse the file, naming the identifier and both places it occurs.</summary>
    Error,
    /// <summary>Keep the first occurrence, ignore later ones for the kept values, and add a note.</summary>
    KeepFirst,
}
