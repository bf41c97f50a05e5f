using System.Globalization;
using System.Text;

namespace ExprModel.Data.Demo;

/// <summary>
/// Generates the demo dataset: an invented pilot survey by the fictional Fernhollow lab of five transcriptomic groups
/// in the made-up "tessellate nucleus" of the mouse. Nothing here is measured: group profiles, gene levels and
/// recorded read-outs are design choices, drawn with a seeded random generator so the committed files are exactly
/// what this code makes. Counts are raw (genes x cells, comma-separated) with library-size variation, overdispersion
/// and dropouts; the metadata holds group labels and, for some cells, recorded read-outs.
/// </summary>
public static class DemoDataGenerator
{
    public const int DefaultSeed = 20261201;
    public const string CountsFileName = "counts.csv";
    public const string MetadataFileName = "metadata.csv";
    public const int CellsPerGroup = 48;
    /// <summary>Invented non-channel genes ("Fhx" + number: a made-up family so no real gene is implied).</summary>
    public const int InventedGenes = 480;

    /// <summary>Channel genes (mouse symbols) and a baseline level in CPM shared by all groups before each group's profile.</summary>
    private static readonly (string Gene, double Cpm)[] ChannelBaseline =
    [
        ("Scn1a", 40), ("Scn2a", 60), ("Scn3a", 10), ("Scn8a", 50), ("Scn9a", 3),
        ("Kcna1", 30), ("Kcna2", 30), ("Kcnb1", 60), ("Kcnc1", 15), ("Kcnc2", 10),
        ("Kcnd2", 30), ("Kcnd3", 15), ("Kcnq2", 20), ("Kcnq3", 15), ("Kcnq5", 10),
        ("Kcnj2", 10), ("Hcn1", 20), ("Hcn2", 20),
        ("Cacna1a", 40), ("Cacna1b", 20), ("Cacna1c", 15), ("Cacna1e", 15), ("Cacna1g", 5), ("Cacna1h", 5), ("Cacna1i", 3),
        ("Kcnn1", 5), ("Kcnn2", 10), ("Kcnn3", 5), ("Kcnk2", 10), ("Kcnk9", 10), ("Nalcn", 20),
        // Auxiliary subunits.
        ("Scn1b", 60), ("Scn2b", 20), ("Scn4b", 10), ("Kcnip1", 10), ("Kcnip4", 20), ("Kcne1", 2), ("Kcnab1", 20),
        ("Cacnb4", 20), ("Cacna2d1", 20),
    ];

    /// <summary>
    /// The large-conductance calcium-activated potassium channel is written under an alias, not its official symbol
    /// Kcnma1, so the mapping step has an alias to resolve.
    /// </summary>
    public const string AliasRow = "Slo1";
    /// <summary>A non-channel gene written twice (two rows, different counts), as happens when two ids share a symbol.</summary>
    public const string DuplicatedRow = "Malat1";
    /// <summary>An Ensembl-shaped id with a version suffix (the number is invented and names no gene).</summary>
    public const string VersionedEnsemblRow = "ENSMUSG00000000000.1";

    /// <summary>Common non-channel genes with a typical share in CPM (housekeeping, neuronal and glial markers).</summary>
    private static readonly (string Gene, double Cpm)[] CommonGenes =
    [
        ("Actb", 3000), ("Gapdh", 2500), ("Tubb3", 800), ("Eef1a1", 2000), ("Rpl13a", 1200), ("Rps18", 1100),
        ("Ppia", 600), ("Ywhaz", 500), ("Hprt", 80), ("Tbp", 30), ("B2m", 150), ("Malat1", 2500), ("Meg3", 600),
        ("Rbfox3", 150), ("Snap25", 1500), ("Syt1", 700), ("Camk2a", 400), ("Nrgn", 300), ("Gria1", 150),
        ("Gria2", 250), ("Grin1", 120), ("Grin2b", 60), ("Gabra1", 120), ("Nefl", 300), ("Nefm", 200),
        ("Gad1", 100), ("Gad2", 80), ("Slc17a7", 100), ("Slc32a1", 50), ("Calb1", 60), ("Calb2", 40),
        ("Mbp", 40), ("Plp1", 40), ("Gfap", 10), ("Aqp4", 10),
    ];

    /// <summary>The five invented groups. Profiles multiply the channel baseline; read-outs are invented typical values.</summary>
    public static IReadOnlyList<DemoGroup> Groups { get; } =
    [
        new("T1-fast", "fast, non-adapting: high Kv3 (Kcnc1/Kcnc2), Nav1.1 and its beta subunits, little M-current",
            Profile(("Kcnc1", 12), ("Kcnc2", 10), ("Scn1a", 3), ("Scn1b", 2), ("Scn4b", 3), ("Kcna1", 2),
                    ("Kcnq2", 0.2), ("Kcnq3", 0.2), ("Kcnq5", 0.1), ("Kcnn2", 0.2), ("Hcn1", 0.3), ("Cacna1g", 0.3)),
            (-68, 120, 180, 180)),
        new("T2-adapting", "adapting: strong M-current (Kcnq2/3/5) and SK (Kcnn2)",
            Profile(("Kcnq2", 5), ("Kcnq3", 5), ("Kcnq5", 6), ("Kcnn2", 6), ("Kcnn3", 3), ("Kcnc1", 0.3), ("Kcnc2", 0.3)),
            (-70, 220, 90, 45)),
        new("T3-bursting", "bursting-prone: high T-type calcium (Cacna1g/h/i), little Hcn1",
            Profile(("Cacna1g", 12), ("Cacna1h", 8), ("Cacna1i", 6), ("Hcn1", 0.15), ("Kcnn2", 2), ("Kcnc1", 0.4)),
            (-62, 300, 60, 60)),
        new("T4-low-threshold", "low-threshold: high persistent-sodium source Scn8a, little Kv1 (Kcna1/Kcna2)",
            Profile(("Scn8a", 5), ("Kcna1", 0.15), ("Kcna2", 0.3), ("Nalcn", 2), ("Kcnc1", 0.4), ("Kcnq2", 0.6)),
            (-58, 350, 35, 30)),
        new("T5-pacing", "slow pacing: high HCN (Hcn1/Hcn2), A-type Kv4 (Kcnd2/3) and Nalcn leak",
            Profile(("Hcn1", 6), ("Hcn2", 5), ("Kcnd2", 3), ("Kcnd3", 3), ("Kcnip1", 4), ("Nalcn", 3), ("Kcnk9", 0.3)),
            (-55, 400, 20, 15)),
    ];

    private static Dictionary<string, double> Profile(params (string Gene, double Factor)[] factors)
    {
        var profile = ChannelBaseline.ToDictionary(c => c.Gene, c => c.Cpm);
        profile["Kcnma1"] = 25;
        foreach (var (gene, factor) in factors) profile[gene] *= factor;
        return profile;
    }

    /// <summary>Writes counts.csv and metadata.csv into a directory (created if needed) and returns their paths.</summary>
    public static (string Counts, string Metadata) WriteTo(string directory, int seed = DefaultSeed)
    {
        Directory.CreateDirectory(directory);
        var data = Generate(seed);
        var counts = Path.Combine(directory, CountsFileName);
        var metadata = Path.Combine(directory, MetadataFileName);
        File.WriteAllText(counts, data.CountsCsv, new UTF8Encoding(false));
        File.WriteAllText(metadata, data.MetadataCsv, new UTF8Encoding(false));
        return (counts, metadata);
    }

    public static DemoDataset Generate(int seed = DefaultSeed)
    {
        var rng = new Draws(seed);
        var cells = new List<(string Id, int Group, int Slice)>();
        for (int g = 0; g < Groups.Count; g++)
            for (int k = 0; k < CellsPerGroup; k++)
                cells.Add(($"FH{g + 1}{k + 1:D3}", g, 1 + rng.Index(6)));

        // Gene rows: channel genes, the alias row, common genes, invented genes, and the ambiguous extra rows.
        var rows = new List<(string Row, Func<int, double> Cpm)>();
        foreach (var (gene, _) in ChannelBaseline)
            rows.Add((gene, g => Groups[g].ChannelCpm[gene]));
        rows.Add((AliasRow, g => Groups[g].ChannelCpm["Kcnma1"]));
        foreach (var (gene, cpm) in CommonGenes) rows.Add((gene, _ => cpm));
        for (int i = 0; i < InventedGenes; i++)
        {
            // Invented genes: log-normal levels around 20 CPM, some of them group-biased so groups also differ elsewhere.
            double level = Math.Exp(Math.Log(20) + 1.3 * rng.Normal());
            int biased = rng.Index(Groups.Count * 3); // one in three biased towards one group
            rows.Add(($"Fhx{101 + i}", g => biased == g ? level * 4 : level));
        }
        rows.Add((DuplicatedRow, _ => 150));
        rows.Add((VersionedEnsemblRow, _ => 40));

        // Library sizes: log-normal around 40,000 counts per cell, varying about 1.6-fold either way.
        var library = cells.Select(_ => Math.Exp(Math.Log(40000) + 0.45 * rng.Normal())).ToArray();
        var counts = new int[rows.Count, cells.Count];
        for (int r = 0; r < rows.Count; r++)
            for (int c = 0; c < cells.Count; c++)
            {
                double mean = rows[r].Cpm(cells[c].Group) * library[c] / 1e6;
                // Overdispersion: a gamma-distributed cell factor with shape 2 (coefficient of variation 0.71), then
                // Poisson sampling; extra dropout where expression is low.
                double lambda = mean * rng.Gamma(2) / 2;
                int n = rng.Poisson(lambda);
                double dropout = 0.3 / (1 + mean);
                counts[r, c] = rng.Uniform() < dropout ? 0 : n;
            }

        var sb = new StringBuilder("gene");
        foreach (var c in cells) sb.Append(',').Append(c.Id);
        sb.Append('\n');
        for (int r = 0; r < rows.Count; r++)
        {
            sb.Append(rows[r].Row);
            for (int c = 0; c < cells.Count; c++) sb.Append(',').Append(counts[r, c].ToString(CultureInfo.InvariantCulture));
            sb.Append('\n');
        }

        var meta = new StringBuilder("cell_id,group,slice,resting potential (mV),input resistance (MOhm),rheobase (pA),max firing rate (Hz)\n");
        foreach (var (id, g, slice) in cells)
        {
            meta.Append(id).Append(',').Append(Groups[g].Name).Append(",s").Append(slice);
            // About a third of the cells were also recorded (patch-coupled sequencing in the story).
            if (rng.Uniform() < 0.35)
            {
                var (rest, rin, rheo, rate) = Groups[g].Recorded;
                meta.Append(',').Append(F(rest + 3 * rng.Normal()))
                    .Append(',').Append(F(rin * Math.Exp(0.2 * rng.Normal())))
                    .Append(',').Append(F(Math.Max(5, rheo * Math.Exp(0.25 * rng.Normal()))))
                    .Append(',').Append(F(Math.Max(1, rate * Math.Exp(0.15 * rng.Normal()))));
            }
            else meta.Append(",,,,");
            meta.Append('\n');
        }
        return new DemoDataset(sb.ToString(), meta.ToString());
    }

    private static string F(double v) => v.ToString("F1", CultureInfo.InvariantCulture);

    /// <summary>Seeded draws. System.Random with a seed gives the same sequence on every run; the distributions are written out here.</summary>
    internal sealed class Draws(int seed)
    {
        private readonly Random _random = new(seed);

        public double Uniform() => _random.NextDouble();
        public int Index(int n) => _random.Next(n);

        /// <summary>Standard normal by the Box-Muller transform (Box and Muller 1958, Ann Math Stat 29:610).</summary>
        public double Normal()
        {
            double u1 = 1 - _random.NextDouble(), u2 = _random.NextDouble();
            return Math.Sqrt(-2 * Math.Log(u1)) * Math.Cos(2 * Math.PI * u2);
        }

        /// <summary>Gamma(shape, scale 1) by Marsaglia and Tsang 2000 (ACM TOMS 26:363), for shape >= 1.</summary>
        public double Gamma(double shape)
        {
            double d = shape - 1.0 / 3, c = 1 / Math.Sqrt(9 * d);
            while (true)
            {
                double x = Normal(), v = 1 + c * x;
                if (v <= 0) continue;
                v = v * v * v;
                double u = Uniform();
                if (Math.Log(u) < 0.5 * x * x + d - d * v + d * Math.Log(v)) return d * v;
            }
        }

        /// <summary>Poisson by multiplying uniforms (Knuth, TAOCP vol. 2) for small means, a rounded normal for large ones.</summary>
        public int Poisson(double lambda)
        {
            if (lambda <= 0) return 0;
            if (lambda > 400) return Math.Max(0, (int)Math.Round(lambda + Math.Sqrt(lambda) * Normal()));
            double limit = Math.Exp(-lambda), p = 1;
            int k = 0;
            do { k++; p *= Uniform(); } while (p > limit);
            return k - 1;
        }
    }
}
