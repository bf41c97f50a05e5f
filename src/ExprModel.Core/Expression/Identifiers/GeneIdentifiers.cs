using System.Text.RegularExpressions;

namespace ExprModel.Core.Expression.Identifiers;

/// <summary>
/// Parsing of gene identifiers: Ensembl gene ids (ENSG human, ENSMUSG mouse, ENSRNOG rat; 11 digits; optional
/// ".version"), and symbols with their species' case conventions (HGNC: human symbols upper case; MGI and RGD:
/// rodent symbols start with a capital and continue in lower case).
/// </summary>
public static partial class GeneIdentifiers
{
    // Ensembl stable gene id: "ENS" + species prefix + "G" + 11 digits, optional ".N" version.
    [GeneratedRegex(@"^ENS([A-Z]{0,6})G(\d{11})(?:\.(\d+))?$")]
    private static partial Regex EnsemblGene();

    // A gene symbol: letters, digits and hyphens/dots/underscores inside, at most 30 characters, starting with a
    // letter, or the RIKEN-style clone names of mouse (e.g. 1700012B09Rik) that start with digits.
    [GeneratedRegex(@"^(?:[A-Za-z][A-Za-z0-9]*(?:[-.][A-Za-z0-9]+)*|\d{7}[A-Z]\d{2}Rik)$")]
    private static partial Regex SymbolShape();

    // A sequencing barcode: a run of nucleotides, often with a "-1" style suffix; never a gene.
    [GeneratedRegex(@"^(?:[A-Za-z0-9]+[_:])?[ACGTN]{8,}(?:-\d+)?$")]
    private static partial Regex Barcode();

    public static ParsedGeneId Parse(string text)
    {
        var t = text.Trim();
        var m = EnsemblGene().Match(t);
        if (m.Success)
        {
            Species? species = m.Groups[1].Value switch
            {
                "" => Species.Human,
                "MUS" => Species.Mouse,
                "RNO" => Species.Rat,
                _ => null,
            };
            int? version = m.Groups[3].Success ? int.Parse(m.Groups[3].Value) : null;
            return new ParsedGeneId(text, IdentifierKind.EnsemblGene, StripEnsemblVersion(t), species, version);
        }
        if (t.Length is > 0 and <= 30 && SymbolShape().IsMatch(t) && !Barcode().IsMatch(t))
            return new ParsedGeneId(text, IdentifierKind.Symbol, t, null, null);
        return new ParsedGeneId(text, IdentifierKind.Other, t, null, null);
    }

    /// <summary>"ENSMUSG00000064329.2" to "ENSMUSG00000064329"; anything else unchanged.</summary>
    public static string StripEnsemblVersion(string id)
    {
        var t = id.Trim();
        if (!t.StartsWith("ENS", StringComparison.Ordinal)) return t;
        int dot = t.LastIndexOf('.');
        return dot > 0 && EnsemblGene().IsMatch(t) ? t[..dot] : t;
    }

    public static bool IsBarcode(string id) => Barcode().IsMatch(id.Trim());

    /// <summary>Upper case (no lower-case letter) is human style; a capital followed by lower case somewhere is rodent style.</summary>
    public static SymbolCase CaseOf(string symbol)
    {
        bool anyLetter = false, anyLower = false;
        foreach (var c in symbol)
        {
            if (char.IsLetter(c)) anyLetter = true;
            if (char.IsLower(c)) anyLower = true;
        }
        if (!anyLetter) return SymbolCase.Other;
        if (!anyLower) return SymbolCase.HumanUpper;
        return char.IsUpper(symbol[0]) || char.IsDigit(symbol[0]) ? SymbolCase.RodentCapitalised : SymbolCase.Other;
    }

    /// <summary>
    /// Writes a symbol in the convention of a species: upper case for human; first letter capital, the rest lower
    /// case for mouse and rat (SCN1A to Scn1a). A case change can only suggest a counterpart: orthologues do not
    /// always share a symbol, so callers must confirm the result against a gene list.
    /// </summary>
    public static string ToSpeciesCase(string symbol, Species species)
    {
        var t = symbol.Trim();
        if (t.Length == 0) return t;
        if (species == Species.Human) return t.ToUpperInvariant();
        return char.ToUpperInvariant(t[0]) + t[1..].ToLowerInvariant();
    }

    /// <summary>
    /// Reports identifiers that would make a gene ambiguous: exact duplicates; the same symbol in different case
    /// (Scn1a and SCN1A); the same Ensembl gene with different version suffixes. Nothing is merged.
    /// </summary>
    public static IReadOnlyList<IdentifierIssue> FindIssues(IEnumerable<string> identifiers)
    {
        var issues = new List<IdentifierIssue>();
        var exact = new Dictionary<string, int>(StringComparer.Ordinal);
        var byCase = new Dictionary<string, HashSet<string>>(StringComparer.OrdinalIgnoreCase);
        var byEnsembl = new Dictionary<string, HashSet<string>>(StringComparer.Ordinal);
        foreach (var id in identifiers)
        {
            exact[id] = exact.GetValueOrDefault(id) + 1;
            var p = Parse(id);
            if (p.Kind == IdentifierKind.EnsemblGene)
            {
                if (!byEnsembl.TryGetValue(p.Key, out var set)) byEnsembl[p.Key] = set = new(StringComparer.Ordinal);
                set.Add(id);
            }
            else
            {
                if (!byCase.TryGetValue(p.Key, out var set)) byCase[p.Key] = set = new(StringComparer.Ordinal);
                set.Add(p.Key);
            }
        }
        foreach (var (id, n) in exact)
            if (n > 1) issues.Add(new("duplicate", [id], $"'{id}' occurs {n} times; the copies are not merged."));
        foreach (var set in byCase.Values)
            if (set.Count > 1)
            {
                var ids = set.Order(StringComparer.Ordinal).ToArray();
                issues.Add(new("case-collision", ids,
                    $"{string.Join(", ", ids.Select(i => $"'{i}'"))} differ only in case: a human and a rodent symbol, or a typing error."));
            }
        foreach (var (key, set) in byEnsembl)
            if (set.Count > 1)
            {
                var ids = set.Order(StringComparer.Ordinal).ToArray();
                issues.Add(new("ensembl-versions", ids, $"{string.Join(", ", ids.Select(i => $"'{i}'"))} are versions of one Ensembl gene {key}."));
            }
        return issues;
    }

    /// <summary>
    /// How much a list of identifiers looks like gene identifiers rather than cell identifiers, 0 to 1: the share that
    /// are Ensembl ids or symbol-shaped (not barcodes), times the share of distinct stems (an identifier without its
    /// trailing digits). Cell names are usually one stem with a running number ("cell_0001"), gene symbols are varied.
    /// </summary>
    public static double GeneLikeness(IReadOnlyList<string> ids)
    {
        if (ids.Count == 0) return 0;
        double shape = 0;
        var stems = new HashSet<string>(StringComparer.OrdinalIgnoreCase);
        foreach (var id in ids)
        {
            var p = Parse(id);
            shape += p.Kind switch { IdentifierKind.EnsemblGene => 1.0, IdentifierKind.Symbol => 0.8, _ => 0.1 };
            // Ensembl ids are unambiguously genes, so each counts as its own stem.
            stems.Add(p.Kind == IdentifierKind.EnsemblGene ? p.Key : id.TrimEnd("0123456789".ToCharArray()));
        }
        double diversity = ids.Count == 1 ? 1 : (double)(stems.Count - 1) / (ids.Count - 1);
        return shape / ids.Count * diversity;
    }
}
