using System.Text.Json.Nodes;
using ExprModel.Core.Cell;
using ExprModel.Core.Models;

namespace ExprModel.Core.Perturbation;

/// <summary>
/// Gene knock-downs of a model built from expression. The model's <c>derivation</c> records, per entry, the weighted
/// genes, the reference and the rule (density = typical x (expression / reference)^exponent, clamped to the entry's
/// plausible range when the rule clamps). A gene at <c>level</c> of its expression lowers the expression of every entry
/// it feeds by (1 - level) x weight x its expression; the entry's density is recomputed with the same rule and
/// reference, and the channel's density is scaled by new / recorded density.
/// </summary>
public static class GeneKnockdowns
{
    /// <summary>One target per gene named in the derivation (in the order first seen), each with its factor on every channel.</summary>
    /// <exception cref="ArgumentException">The model records no derivation from expression, or a density entry is malformed (names it).</exception>
    public static IReadOnlyList<KnockdownTarget> Targets(ModelDocument doc, CellModel model, double level)
    {
        if (doc.Derivation?["densities"] is not JsonArray densities)
            throw new ArgumentException($"model '{doc.Name}': no derivation.densities; gene knock-downs need a model built from expression (exprmodel build).");
        double exponent = Number(doc.Derivation, "exponent", "derivation");
        bool clamp = doc.Derivation["clamp"]?.GetValue<bool>() ?? true;
        var perEntry = new List<(string Entry, double Expression, double Reference, double Typical, double Density,
            List<(string Gene, double Weight, double Expression)> Genes)>();
        for (int i = 0; i < densities.Count; i++)
        {
            var where = $"derivation.densities[{i}]";
            var d = densities[i] as JsonObject ?? throw new ArgumentException($"model '{doc.Name}': {where} is not an object.");
            var entry = d["entry"]?.GetValue<string>() ?? throw new ArgumentException($"model '{doc.Name}': {where}.entry is missing.");
            var genes = new List<(string, double, double)>();
            if (d["genes"] is JsonArray ga)
                for (int j = 0; j < ga.Count; j++)
                {
                    var g = ga[j] as JsonObject ?? throw new ArgumentException($"model '{doc.Name}': {where}.genes[{j}] is not an object.");
                    genes.Add((g["gene"]?.GetValue<string>() ?? throw new ArgumentException($"model '{doc.Name}': {where}.genes[{j}].gene is missing."),
                        Number(g, "weight", $"{where}.genes[{j}]"), Number(g, "expression", $"{where}.genes[{j}]")));
                }
            perEntry.Add((entry, Number(d, "expression", where), Number(d, "reference", where), Number(d, "typicalMsPerCm2", where),
                Number(d, "densityMsPerCm2", where), genes));
        }

        var geneNames = perEntry.SelectMany(e => e.Genes.Select(g => g.Gene)).Distinct(StringComparer.Ordinal).ToArray();
        var targets = new List<KnockdownTarget>();
        foreach (var gene in geneNames)
        {
            var factors = Enumerable.Repeat(1.0, model.Channels.Count).ToArray();
            foreach (var e in perEntry)
            {
                double lost = e.Genes.Where(g => g.Gene == gene).Sum(g => (1 - level) * g.Weight * g.Expression);
                if (lost == 0 || !(e.Density > 0)) continue;
                int k = IndexOf(model, e.Entry);
                if (k < 0) continue;
                var entry = model.Channels[k].Entry;
                double ratio = e.Reference > 0 ? Math.Max(0, e.Expression - lost) / e.Reference : 0;
                double density = e.Typical * Math.Pow(ratio, exponent);
                if (clamp && density > 0) density = Math.Clamp(density, entry.MinDensityMsPerCm2, entry.MaxDensityMsPerCm2);
                factors[k] = density / e.Density;
            }
            targets.Add(new KnockdownTarget(gene, KnockdownKind.Gene, factors));
        }
        return targets;
    }

    private static int IndexOf(CellModel model, string entryId)
    {
        for (int k = 0; k < model.Channels.Count; k++) if (model.Channels[k].Entry.Id == entryId) return k;
        return -1;
    }

    private static double Number(JsonNode node, string field, string where) =>
        node[field] is JsonValue v && v.TryGetValue<double>(out var x) && double.IsFinite(x) ? x
            : throw new ArgumentException($"{where}.{field} must be a number.");
}
