using ExprModel.Core.Expression.Identifiers;

namespace ExprModel.Core.Expression;

/// <summary>
/// Tracks every gene identifier met while reading, decides whether each occurrence is kept, and handles duplicates
/// by <see cref="DuplicateGenePolicy"/>: never merged, a kept duplicate is an error or (by choice) first-wins with a
/// note; a duplicate that is not kept is only noted.
/// </summary>
internal sealed class GeneRegistry(string file, ExpressionReadOptions options, List<string> notes)
{
    private const int MaxDuplicateNotes = 20;
    private readonly Dictionary<string, string> _firstSeen = new(StringComparer.Ordinal);
    private int _duplicateNotes, _moreDuplicates;

    public int Total { get; private set; }

    /// <summary>True if this occurrence's values should be kept.</summary>
    public bool Add(string gene, string location)
    {
        Total++;
        if (string.IsNullOrWhiteSpace(gene))
            throw new ExpressionFormatException($"{file}: {location}: empty gene identifier.");
        bool wanted = options.KeepGene?.Invoke(gene) ?? true;
        if (_firstSeen.TryAdd(gene, location)) return wanted;
        string first = _firstSeen[gene];
        if (wanted && options.DuplicateGenes == DuplicateGenePolicy.Error)
            throw new ExpressionFormatException(
                $"{file}: {location}: gene '{gene}' is duplicated (first at {first}); duplicates are not merged. Remove or rename one, " +
                    "or choose to keep the first.");
        if (_duplicateNotes < MaxDuplicateNotes)
        {
            _duplicateNotes++;
            notes.Add(wanted
                ? $"gene '{gene}' at {location} duplicates {first}: kept the first as chosen; both count towards library size."
                : $"gene '{gene}' appears more than once ({first}, {location}); not kept, every copy counts towards library size.");
        }
        else _moreDuplicates++;
        return false;
    }

    /// <summary>Adds notes for identifiers that are distinct strings but may name one gene (case, Ensembl version).</summary>
    public void Finish()
    {
        if (_moreDuplicates > 0) notes.Add($"... and {_moreDuplicates} more duplicated gene identifiers.");
        var issues = GeneIdentifiers.FindIssues(_firstSeen.Keys).Where(i => i.Kind != "duplicate").ToList();
        foreach (var issue in issues.Take(MaxDuplicateNotes)) notes.Add($"ambiguous gene identifiers: {issue.Message}");
        if (issues.Count > MaxDuplicateNotes) notes.Add($"... and {issues.Count - MaxDuplicateNotes} more ambiguous identifier groups.");
        var versioned = _firstSeen.Keys.Where(k => GeneIdentifiers.Parse(k) is { Kind: IdentifierKind.EnsemblGene, EnsemblVersion: not null }).ToList();
        if (versioned.Count > 0)
            notes.Add($"{versioned.Count} gene identifiers are Ensembl ids with a version suffix (e.g. '{versioned[0]}'); match them without the suffix.");
    }
}
