using System.Text.Json;
using System.Text.Json.Serialization;
using ExprModel.Core.Kinetics;
using ExprModel.Core.Models;

namespace ExprModel.Data.Catalog;

/// <summary>
/// The human-reviewable source file of one catalog entry (catalog/entries/ID.vN.json). Field names are ours;
/// see DEVELOPERS.md ("Catalog entry file"). Parsing errors name the file, line and JSON path.
/// </summary>
public static class EntryFile
{
    internal static readonly JsonSerializerOptions Options = CreateOptions();

    private static JsonSerializerOptions CreateOptions()
    {
        var o = new JsonSerializerOptions(JsonSerializerDefaults.Web)
        {
            UnmappedMemberHandling = JsonUnmappedMemberHandling.Disallow,
            ReadCommentHandling = JsonCommentHandling.Skip,
            WriteIndented = true,
            DefaultIgnoreCondition = JsonIgnoreCondition.WhenWritingNull,
        };
        o.Converters.Add(new JsonStringEnumConverter(JsonNamingPolicy.KebabCaseLower));
        return o;
    }

    public static ChannelEntry Parse(string json, string fileName)
    {
        EntryDto? dto;
        try
        {
            dto = JsonSerializer.Deserialize<EntryDto>(json, Options);
        }
        catch (JsonException e)
        {
            throw new CatalogException(JsonErrorMessage.For(e, fileName));
        }
        if (dto is null) throw new CatalogException($"{fileName}: empty entry file.");
        try
        {
            var entry = dto.ToEntry();
            if (entry.Problem() is { } p) throw new CatalogException($"{fileName}: {p}");
            return entry;
        }
        catch (CatalogException) { throw; }
        catch (Exception e) when (e is ArgumentException or InvalidOperationException or NullReferenceException)
        {
            throw new CatalogException($"{fileName}: entry {dto.Id}: {e.Message}");
        }
    }

    /// <summary>Writes an entry back in source form (used when the catalog is exported).</summary>
    public static string Write(ChannelEntry e) => JsonSerializer.Serialize(EntryDto.From(e), Options);

    internal sealed class EntryDto
    {
        public required string Id { get; set; }
        public required int Version { get; set; }
        public required string Name { get; set; }
        public required string Family { get; set; }
        public required Ion Ion { get; set; }
        public required ReversalDto Reversal { get; set; }
        public required double TemperatureC { get; set; }
        public double Q10 { get; set; } = 3;
        public required DensityDto DensityMsPerCm2 { get; set; }
        public required List<GateDto> Gates { get; set; }
        public required SourceDto Source { get; set; }
        public string Preparation { get; set; } = "";
        public string CuratorNote { get; set; } = "";
        public List<PublishedDto> Published { get; set; } = [];
        public SourceDensityDto? SourceDensity { get; set; }

        public ChannelEntry ToEntry() => new()
        {
            Id = Id,
            Version = Version,
            Name = Name,
            Family = Family,
            Ion = Ion,
            Reversal = Reversal.Rule,
            ReversalMv = Reversal.Mv,
            ReferenceTemperatureC = TemperatureC,
            Q10 = Q10,
            TypicalDensityMsPerCm2 = DensityMsPerCm2.Typical,
            MinDensityMsPerCm2 = DensityMsPerCm2.Min,
            MaxDensityMsPerCm2 = DensityMsPerCm2.Max,
            Gates = Gates.Select((g, i) => g.ToGate(i)).ToArray(),
            Source = Source.ToCitation(),
            Preparation = Preparation,
            CuratorNote = CuratorNote,
            PublishedValues = Published.Select(p => p.ToValue()).ToArray(),
            SourceDensity = SourceDensity?.ToDensity(),
        };

        public static EntryDto From(ChannelEntry e) => new()
        {
            Id = e.Id,
            Version = e.Version,
            Name = e.Name,
            Family = e.Family,
            Ion = e.Ion,
            Reversal = new ReversalDto { Rule = e.Reversal, Mv = e.ReversalMv },
            TemperatureC = e.ReferenceTemperatureC,
            Q10 = e.Q10,
            DensityMsPerCm2 = new DensityDto { Typical = e.TypicalDensityMsPerCm2, Min = e.MinDensityMsPerCm2, Max = e.MaxDensityMsPerCm2 },
            Gates = e.Gates.Select(GateDto.From).ToList(),
            Source = SourceDto.From(e.Source),
            Preparation = e.Preparation,
            CuratorNote = e.CuratorNote,
            Published = e.PublishedValues.Select(PublishedDto.From).ToList(),
            SourceDensity = SourceDensityDto.From(e.SourceDensity),
        };
    }

    internal sealed class ReversalDto
    {
        public required ReversalRule Rule { get; set; }
        public double? Mv { get; set; }
    }

    /// <summary>The conductance as the paper states it: value and unit, with the capacitance or area an nS value refers to.</summary>
    internal sealed class SourceDensityDto
    {
        public required double Value { get; set; }
        public required string Unit { get; set; }
        public double? CapacitancePf { get; set; }
        public double? AreaUm2 { get; set; }
        public double CapacitanceUfPerCm2 { get; set; } = 1;
        public required string Where { get; set; }

        public SourceDensity ToDensity() => new(Value, Unit, CapacitancePf, AreaUm2, CapacitanceUfPerCm2, Where);

        public static SourceDensityDto? From(SourceDensity? d) => d is null ? null : new()
        {
            Value = d.Value,
            Unit = d.Unit,
            CapacitancePf = d.CapacitancePf,
            AreaUm2 = d.AreaUm2,
            CapacitanceUfPerCm2 = d.CapacitanceUfPerCm2,
            Where = d.Where,
        };
    }

    internal sealed class DensityDto
    {
        public required double Typical { get; set; }
        public required double Min { get; set; }
        public required double Max { get; set; }
    }

    internal sealed class GateDto
    {
        public required string Name { get; set; }
        public int Power { get; set; } = 1;
        public RateDto? Alpha { get; set; }
        public RateDto? Beta { get; set; }
        public RateDto? Steady { get; set; }
        public RateDto? TauMs { get; set; }
        public CalciumDto? Calcium { get; set; }
        /// <summary>A sodium-gated subunit: the same fields as <see cref="Calcium"/>, in mM of shell sodium.</summary>
        public CalciumDto? Sodium { get; set; }
        public bool Instantaneous { get; set; }
        public double RateFactor { get; set; } = 1;

        public GateSpec ToGate(int index)
        {
            bool calciumRates = (Alpha is not null && IsCalciumShape(Alpha.Shape)) || (Beta is not null && IsCalciumShape(Beta.Shape));
            if (Sodium is not null && (Calcium is not null || calciumRates || Alpha is not null || Beta is not null || Steady is not null))
                throw new ArgumentException($"gates[{index}] ({Name}): a sodium gate takes only 'sodium' (no calcium, alpha, beta or steady).");
            GateKind kind = Sodium is not null ? GateKind.Sodium
                : Calcium is not null || calciumRates ? GateKind.Calcium
                : Alpha is not null || Beta is not null ? GateKind.AlphaBeta
                : Steady is not null ? GateKind.SteadyStateAndTau
                : throw new ArgumentException($"gates[{index}] ({Name}): give alpha and beta, or steady and tauMs, or calcium, or sodium.");
            return new GateSpec
            {
                Name = Name,
                Power = Power,
                Kind = kind,
                Alpha = Alpha?.ToRate($"gates[{index}].alpha"),
                Beta = Beta?.ToRate($"gates[{index}].beta"),
                SteadyState = Steady?.ToRate($"gates[{index}].steady"),
                TimeConstantMs = TauMs?.ToRate($"gates[{index}].tauMs"),
                Calcium = Calcium is null ? null : new CalciumSensitivity(Calcium.HalfActivationMm, Calcium.Hill, Calcium.TauMs),
                Sodium = Sodium is null ? null : new SodiumSensitivity(Sodium.HalfActivationMm, Sodium.Hill, Sodium.TauMs),
                Instantaneous = Instantaneous,
                RateFactor = RateFactor,
            };
        }

        private static bool IsCalciumShape(string shape) => shape is "calcium-bound-opening" or "calcium-bound-closing";

        public static GateDto From(GateSpec g) => new()
        {
            Name = g.Name,
            Power = g.Power,
            Alpha = RateDto.From(g.Alpha),
            Beta = RateDto.From(g.Beta),
            Steady = RateDto.From(g.SteadyState),
            TauMs = RateDto.From(g.TimeConstantMs),
            Calcium = g.Calcium is null ? null
                : new CalciumDto { HalfActivationMm = g.Calcium.HalfActivationMm, Hill = g.Calcium.HillCoefficient, TauMs = g.Calcium.TimeConstantMs },
            Sodium = g.Sodium is null ? null
                : new CalciumDto { HalfActivationMm = g.Sodium.HalfActivationMm, Hill = g.Sodium.HillCoefficient, TauMs = g.Sodium.TimeConstantMs },
            Instantaneous = g.Instantaneous,
            RateFactor = g.RateFactor,
        };
    }

    internal sealed class CalciumDto
    {
        public required double HalfActivationMm { get; set; }
        public required double Hill { get; set; }
        public required double TauMs { get; set; }
    }

    /// <summary>
    /// A rate form: shape is one of exponential, sigmoid, linear-over-exponential, boltzmann, constant, bell, gaussian,
    /// offset-sigmoid, inverse-rate-sum, calcium-bound-opening, calcium-bound-closing.
    /// Parameter names follow <see cref="GateRate"/>; boltzmann uses vHalf and slope.
    /// </summary>
    internal sealed class RateDto
    {
        public required string Shape { get; set; }
        public double? A { get; set; }
        public double? V0 { get; set; }
        public double? K { get; set; }
        public double? VHalf { get; set; }
        public double? Slope { get; set; }
        public double? Exponent { get; set; }
        public double? Floor { get; set; }
        public double? Base { get; set; }
        public double? V1 { get; set; }
        public double? K1 { get; set; }
        public double? C1 { get; set; }
        public double? C2 { get; set; }
        public double? Value { get; set; }

        private double Need(double? x, string name, string where) => x ?? throw new ArgumentException($"{where}: shape '{Shape}' needs '{name}'.");

        public GateRate ToRate(string where) => Shape switch
        {
            "exponential" => GateRate.Exponential(Need(A, "a", where), Need(V0, "v0", where), Need(K, "k", where)),
            "sigmoid" => GateRate.Sigmoid(Need(A, "a", where), Need(V0, "v0", where), Need(K, "k", where)),
            "linear-over-exponential" => GateRate.LinearOverExponential(Need(A, "a", where), Need(V0, "v0", where), Need(K, "k", where)),
            "boltzmann" => GateRate.Boltzmann(Need(VHalf, "vHalf", where), Need(Slope, "slope", where), Exponent ?? 1, Floor ?? 0),
            "constant" => GateRate.Constant(Need(Value, "value", where)),
            "bell" => GateRate.Bell(Base ?? 0, Need(A, "a", where), Need(V0, "v0", where), Need(K, "k", where), Need(V1, "v1", where), Need(K1, "k1", where),
                C1 ?? 1, C2 ?? 1),
            "gaussian" => GateRate.Gaussian(Base ?? 0, Need(A, "a", where), Need(V0, "v0", where), Need(K, "k", where)),
            "offset-sigmoid" => GateRate.OffsetSigmoid(Need(Base, "base", where), Need(A, "a", where), Need(V0, "v0", where), Need(K, "k", where)),
            "inverse-rate-sum" => GateRate.InverseRateSum(Need(A, "a", where), Need(V0, "v0", where), Need(K, "k", where), Need(C1, "c1", where),
                Need(V1, "v1", where), Need(K1, "k1", where)),
            "calcium-bound-opening" => GateRate.CalciumBoundOpening(Need(A, "a", where), Need(C1, "c1", where), Need(K, "k", where)),
            "calcium-bound-closing" => GateRate.CalciumBoundClosing(Need(A, "a", where), Need(C1, "c1", where), Need(K, "k", where)),
            _ => throw new ArgumentException($"{where}: unknown shape '{Shape}' (use exponential, sigmoid, linear-over-exponential, boltzmann, constant, " +
                "bell, gaussian, offset-sigmoid, inverse-rate-sum, calcium-bound-opening or calcium-bound-closing)."),
        };

        public static RateDto? From(GateRate? r) => r is null ? null : r.Shape switch
        {
            RateShape.Exponential => new() { Shape = "exponential", A = r.A, V0 = r.V0, K = r.K },
            RateShape.Sigmoid => new() { Shape = "sigmoid", A = r.A, V0 = r.V0, K = r.K },
            RateShape.LinearOverExponential => new() { Shape = "linear-over-exponential", A = r.A, V0 = r.V0, K = r.K },
            RateShape.Boltzmann =>
                new() { Shape = "boltzmann", VHalf = r.V0, Slope = r.K, Exponent = r.Exponent == 1 ? null : r.Exponent, Floor = r.Floor == 0 ? null : r.Floor },
            RateShape.Constant => new() { Shape = "constant", Value = r.A },
            RateShape.Bell => new()
            {
                Shape = "bell",
                Base = r.Base,
                A = r.A,
                V0 = r.V0,
                K = r.K,
                V1 = r.V1,
                K1 = r.K1,
                C1 = r.C1 == 1 ? null : r.C1,
                C2 = r.C2 == 1 ? null : r.C2
            },
            RateShape.Gaussian => new() { Shape = "gaussian", Base = r.Base, A = r.A, V0 = r.V0, K = r.K },
            RateShape.OffsetSigmoid => new() { Shape = "offset-sigmoid", Base = r.Base, A = r.A, V0 = r.V0, K = r.K },
            RateShape.InverseRateSum => new() { Shape = "inverse-rate-sum", A = r.A, V0 = r.V0, K = r.K, C1 = r.C1, V1 = r.V1, K1 = r.K1 },
            RateShape.CalciumBoundOpening => new() { Shape = "calcium-bound-opening", A = r.A, C1 = r.C1, K = r.K },
            RateShape.CalciumBoundClosing => new() { Shape = "calcium-bound-closing", A = r.A, C1 = r.C1, K = r.K },
            _ => throw new InvalidOperationException(),
        };
    }

    internal sealed class SourceDto
    {
        public required string Authors { get; set; }
        public required int Year { get; set; }
        public string Title { get; set; } = "";
        public required string Journal { get; set; }
        public string Volume { get; set; } = "";
        public string Pages { get; set; } = "";
        public string Doi { get; set; } = "";
        public string Location { get; set; } = "";
        public required Verification Verification { get; set; }
        /// <summary>unchecked, confirmed or not-found: the citation compared with the paper's abstract page.</summary>
        public CitationCheck Citation { get; set; } = CitationCheck.Unchecked;
        public string CitationCheckedAt { get; set; } = "";
        public string CitationNote { get; set; } = "";

        public Citation ToCitation() => new()
        {
            Authors = Authors,
            Year = Year,
            Title = Title,
            Journal = Journal,
            Volume = Volume,
            Pages = Pages,
            Doi = Doi,
            Location = Location,
            Verification = Verification,
            CitationCheck = Citation,
            CitationCheckedAt = CitationCheckedAt,
            CitationNote = CitationNote,
        };

        public static SourceDto From(Citation c) => new()
        {
            Authors = c.Authors,
            Year = c.Year,
            Title = c.Title,
            Journal = c.Journal,
            Volume = c.Volume,
            Pages = c.Pages,
            Doi = c.Doi,
            Location = c.Location,
            Verification = c.Verification,
            Citation = c.CitationCheck,
            CitationCheckedAt = c.CitationCheckedAt,
            CitationNote = c.CitationNote,
        };
    }

    internal sealed class PublishedDto
    {
        public required string Quantity { get; set; }
        public required string Gate { get; set; }
        public required double Value { get; set; }
        public double AtMv { get; set; }
        public required double Tolerance { get; set; }
        public required string Where { get; set; }

        public PublishedValue ToValue() => new() { Quantity = Quantity, Gate = Gate, Value = Value, AtMv = AtMv, Tolerance = Tolerance, Where = Where };
        public static PublishedDto From(PublishedValue p) =>
            new() { Quantity = p.Quantity, Gate = p.Gate, Value = p.Value, AtMv = p.AtMv, Tolerance = p.Tolerance, Where = p.Where };
    }
}
