using System.Globalization;
using System.Text.Json.Nodes;
using ExprModel.Core.Models;

namespace ExprModel.Core.Perturbation;

/// <summary>The words and the model file a fit produces: the plain summary sentence and the fitted document with its record.</summary>
public static class FitReport
{
    /// <summary>One sentence on how far expression alone is from the recording, and what the fit had to change.</summary>
    public static string Summary(IReadOnlyList<FitResidual> residuals, IReadOnlyList<FitChannel> channels, double misfitBefore, double misfitAfter)
    {
        var worst = residuals.OrderByDescending(r => Math.Abs(r.ScaledBefore ?? double.PositiveInfinity)).First();
        string worstText = worst.Before is { } b
            ? $"worst {worst.Readout}: {F(b)} against {F(worst.Recorded)} {worst.Unit}"
            : $"worst {worst.Readout}: undefined in the model, {F(worst.Recorded)} {worst.Unit} recorded";
        var moved = channels.Where(c => !c.Fixed).OrderByDescending(c => Math.Abs(Math.Log(c.FoldChange))).Take(3)
            .Select(c => $"{c.Channel} x{F(c.FoldChange)}{(c.Pinned ? "" : " (not pinned down)")}");
        return $"Expression alone misses the {residuals.Count} recorded read-out(s) by {F(misfitBefore)} scale(s) RMS ({worstText}); " +
            $"the fit brings this to {F(misfitAfter)} with the largest fold changes {string.Join(", ", moved)}.";
    }

    /// <summary>
    /// The fitted model: the input document with each fitted channel's relativeDensity set (densityMsPerCm2 stays the
    /// expression-derived value, so the slider shows the fold change), and a "fit" object added to its derivation with
    /// the targets, scales, prior width, residuals, optimiser, seed and identifiability. Derivation is free-form in the
    /// model file, so the schema is unchanged and older readers open the file.
    /// </summary>
    public static ModelDocument Document(ModelDocument doc, FitResult fit)
    {
        var s = fit.Settings;
        var record = new JsonObject
        {
            ["method"] = "minimise sum ((predicted - recorded) / scale)^2 + sum (ln(relativeDensity) / priorWidth)^2 over ln(relativeDensity), bounded by " +
                "each entry's plausible density range",
            ["priorWidthLn"] = s.PriorWidth is { } w ? JsonValue.Create(w) : JsonValue.Create("none"),
            ["optimiser"] = s.Optimiser == FitOptimiser.Simplex ? "MathNet.Numerics NelderMeadSimplex"
                : "MathNet.Numerics LevenbergMarquardtMinimizer (forward differences in ln density)",
            ["jacobianStepLn"] = s.JacobianStepLn,
            ["seed"] = s.Seed,
            ["starts"] = s.Starts,
            ["evaluations"] = fit.Evaluations,
            ["rheobaseRelativeTolerance"] = s.Readouts.RheobaseRelativeTolerance,
            ["objectiveBefore"] = fit.ObjectiveBefore,
            ["objectiveAfter"] = fit.ObjectiveAfter,
            ["targets"] = new JsonArray(fit.Residuals.Select(r => (JsonNode)new JsonObject
            {
                ["readout"] = r.Readout,
                ["unit"] = r.Unit,
                ["recorded"] = r.Recorded,
                ["scale"] = r.Scale,
                ["weight"] = 1 / (r.Scale * r.Scale),
                ["before"] = r.Before,
                ["after"] = r.After,
                ["scaledResidualAfter"] = r.ScaledAfter,
            }).ToArray()),
            ["channels"] = new JsonArray(fit.Channels.Select(c => (JsonNode)new JsonObject
            {
                ["channel"] = c.Channel,
                ["startRelative"] = c.StartRelative,
                ["fittedRelative"] = c.FittedRelative,
                ["fixed"] = c.Fixed,
                ["pinned"] = c.Pinned,
                ["dataSdLn"] = double.IsFinite(c.DataSdLn) ? c.DataSdLn : null,
                ["atBound"] = c.AtBound,
            }).ToArray()),
            ["singularValues"] = new JsonArray(fit.Identifiability.SingularValues.Select(v => (JsonNode?)JsonValue.Create(v)).ToArray()),
            ["summary"] = fit.Summary,
        };
        var derivation = doc.Derivation?.DeepClone() as JsonObject ?? new JsonObject();
        derivation["fit"] = record;
        var relative = fit.Channels.Where(c => !c.Fixed).ToDictionary(c => c.Channel, c => c.FittedRelative);
        var labels = fit.Channels.Select(c => c.Channel).ToArray();
        return doc with
        {
            Name = doc.Name + " (fitted)",
            Channels = doc.Channels.Select((c, k) => relative.TryGetValue(labels[k], out var r) ? c with { RelativeDensity = r } : c).ToArray(),
            Derivation = derivation,
            Notes = (doc.Notes.Length > 0 ? doc.Notes + "\n" : "") + "Fitted to recorded read-outs: " + fit.Summary,
            Caution = ResearchCaution.Text,
        };
    }

    private static string F(double v) => v.ToString("G3", CultureInfo.InvariantCulture);
}
