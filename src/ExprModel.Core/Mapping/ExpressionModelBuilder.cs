using System.Text.Json.Nodes;
using ExprModel.Core.Cell;
using ExprModel.Core.Expression;
using ExprModel.Core.Models;

namespace ExprModel.Core.Mapping;

/// <summary>Turns an expression table, its mapping and a density rule into a model file that records how it was made.</summary>
public static class ExpressionModelBuilder
{
    public static BuiltModel Build(ExpressionTable table, MappingReport report, MappingCatalog catalog, DensityRule rule, ModelTarget target,
        CellGroups? groups)
    {
        if (rule.Problem() is { } p) throw new ArgumentException("density rule: " + p);
        var warnings = new List<string>();
        int[] targetCells = TargetCells(table, target, groups);
        int[]? referenceCells = null;
        if (rule.Reference == DensityReference.ReferenceGroup && rule.FixedReferences is null)
        {
            if (groups is null) throw new ArgumentException("A reference group needs a metadata table with a group column.");
            if (!groups.Members.TryGetValue(rule.ReferenceGroup!, out referenceCells))
                throw new ArgumentException($"Reference group '{rule.ReferenceGroup}' is not among the groups ({string.Join(", ", groups.Members.Keys)}).");
        }

        var entryExpression = report.EntryExpression();
        var channels = new List<ChannelDocument>();
        var derivations = new List<DensityDerivation>();
        bool needsShell = false, needsSodiumShell = false;
        foreach (var (entryId, perCell) in entryExpression)
        {
            var entry = catalog.Entry(entryId)!;
            var density = rule.DensityFor(entry, perCell, targetCells, referenceCells);
            if (density.ClampNote is { } note) warnings.Add(note);
            var contributions = report.Genes.Where(g => !g.Excluded)
                .SelectMany(g => g.Entries.Where(e => e.EntryId == entryId)
                    .Select(e => new GeneContribution(g.Symbol, e.Weight, targetCells.Average(i => g.ExpressionByCell[i]))))
                .ToArray();
            derivations.Add(new DensityDerivation(entryId, entry.Version, density.Expression, density.Reference, density.Ratio, entry.TypicalDensityMsPerCm2,
                density.RawMsPerCm2, density.DensityMsPerCm2, density.Clamped, contributions));
            if (density.DensityMsPerCm2 <= 0) continue;
            channels.Add(new ChannelDocument { Entry = entryId, Version = entry.Version, DensityMsPerCm2 = density.DensityMsPerCm2 });
            if (entry.Gates.Any(g => g.Kind == Kinetics.GateKind.Calcium) || entry.Ion == Kinetics.Ion.Calcium) needsShell = true;
            if (entry.Gates.Any(g => g.Kind == Kinetics.GateKind.Sodium)) needsSodiumShell = true;
        }
        var leak = catalog.Entry("leak") ?? throw new ArgumentException("The catalog has no 'leak' entry.");
        channels.Add(new ChannelDocument { Entry = "leak", Version = leak.Version, DensityMsPerCm2 = rule.LeakMsPerCm2, ReversalMv = rule.LeakReversalMv });
        if (!derivations.Any(d => d.DensityMsPerCm2 > 0 && catalog.Entry(d.EntryId)!.Ion == Kinetics.Ion.Sodium))
            warnings.Add("No sodium channel entry is expressed: the model cannot fire action potentials.");

        var derivation = new JsonObject
        {
            ["method"] = DensityRule.Method,
            ["source"] = table.Source,
            ["unit"] = table.Unit.ToString(),
            ["unitNote"] = table.UnitNote,
            ["target"] = target.Label,
            ["targetCells"] = targetCells.Length,
            ["reference"] = rule.ReferenceLabel,
            ["exponent"] = rule.Exponent,
            ["clamp"] = rule.ClampToPlausibleRange,
            ["overrides"] = new JsonArray(report.Overrides.Select(o => (JsonNode)new JsonObject
            {
                ["gene"] = o.Gene,
                ["exclude"] = o.Exclude,
                ["entry"] = o.EntryId,
                ["weight"] = o.Weight,
            }).ToArray()),
            ["densities"] = new JsonArray(derivations.Select(d => (JsonNode)new JsonObject
            {
                ["entry"] = d.EntryId,
                ["version"] = d.Version,
                ["expression"] = d.Expression,
                ["reference"] = d.Reference,
                ["ratio"] = d.Ratio,
                ["typicalMsPerCm2"] = d.TypicalMsPerCm2,
                ["predictedMsPerCm2"] = d.RawMsPerCm2,
                ["densityMsPerCm2"] = d.DensityMsPerCm2,
                ["clamped"] = d.Clamped,
                ["genes"] = new JsonArray(d.Genes.Select(g =>
                    (JsonNode)new JsonObject { ["gene"] = g.Gene, ["weight"] = g.Weight, ["expression"] = g.Expression }).ToArray()),
            }).ToArray()),
            ["warnings"] = new JsonArray(warnings.Select(w => (JsonNode)JsonValue.Create(w)!).ToArray()),
        };
        var doc = new ModelDocument
        {
            Name = $"{target.Label} ({Path.GetFileName(table.Source)})",
            Description = $"Built from expression of {targetCells.Length} cell(s); densities relative to the " +
                $"{(rule.Reference == DensityReference.ReferenceGroup ? "reference group " + rule.ReferenceGroup : "dataset median")}.",
            Cell = new CellGeometryDocument { CapacitancePf = rule.CapacitancePf },
            TemperatureC = rule.TemperatureC,
            InitialVoltageMv = rule.LeakReversalMv,
            CalciumShell = needsShell ? new CalciumShell() : null,
            SodiumShell = needsSodiumShell ? new SodiumShell() : null,
            Channels = channels,
            Derivation = derivation,
        };
        return new BuiltModel(doc, derivations, warnings);
    }

    private static int[] TargetCells(ExpressionTable table, ModelTarget target, CellGroups? groups)
    {
        if (target.Group is { } g)
        {
            if (groups is null) throw new ArgumentException("Building a group's model needs a metadata table and --group-by column.");
            return groups.Members.TryGetValue(g, out var m) && m.Length > 0 ? m
                : throw new ArgumentException($"Group '{g}' is not in column '{groups.Column}' (groups: {string.Join(", ", groups.Members.Keys)}).");
        }
        if (target.CellId is { } c)
        {
            for (int i = 0; i < table.CellIds.Count; i++) if (table.CellIds[i] == c) return [i];
            throw new ArgumentException($"Cell '{c}' is not in {table.Source}.");
        }
        throw new ArgumentException("Choose a group or a cell to model.");
    }
}
