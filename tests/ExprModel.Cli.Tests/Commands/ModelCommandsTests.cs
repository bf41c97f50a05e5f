using System.Globalization;
using System.Text.Json;

namespace ExprModel.Cli.Tests.Commands;

public class ModelCommandsTests
{
    [Fact]
    public void FiWritesHeaderAmplitudeFirstAndSpikesInStep()
    {
        var (exit, stdout, err) =
            CliRunner.Run("fi", "--preset", "hh1952", "--from", "0", "--to", "19.375", "--steps", "32", "--duration", "1000", "--format", "csv");
        Assert.True(exit == 0, err);
        var lines = stdout.Split('\n', StringSplitOptions.RemoveEmptyEntries).Where(l => !l.StartsWith('#')).ToArray();
        var header = lines[0].Split(',');
        Assert.StartsWith("amplitude", header[0]);
        Assert.Contains("spike_count", header);
        Assert.Equal(33, lines.Length);
        int countCol = Array.IndexOf(header, "spike_count");
        var rows = lines.Skip(1).Select(l => l.Split(',')).ToArray();
        Assert.Equal(19.375, double.Parse(rows[^1][0], CultureInfo.InvariantCulture), 9);
        // Squid-axon model at 6.3 C: no spikes at 0, repetitive firing at tens of Hz by 10 uA/cm2 (Hodgkin & Huxley 1952 model; Rinzel & Miller 1980).
        Assert.Equal(0, int.Parse(rows[0][countCol], CultureInfo.InvariantCulture));
        Assert.InRange(int.Parse(rows[16][countCol], CultureInfo.InvariantCulture), 40, 120);
        Assert.Contains("Research tool", stdout);
    }

    [Fact]
    public void FiInPicoampsMatchesDensityForTheCellArea()
    {
        // hh1952 has 1000 um2: 1 uA/cm2 is 10 pA (DOMAIN.md units).
        var density = CliRunner.Run("fi", "--preset", "hh1952", "--from", "8", "--to", "8", "--steps", "1");
        var absolute = CliRunner.Run("fi", "--preset", "hh1952", "--from", "80", "--to", "80", "--steps", "1", "--units", "pA");
        string Count(string s) => s.Split('\n').First(l => l.StartsWith("8")).Split(',')[1];
        Assert.Equal(Count(density.Out), Count(absolute.Out));
        Assert.Contains("amplitude_pa", absolute.Out);
    }

    [Fact]
    public void FeaturesWritesEveryReadoutAsJson()
    {
        var (exit, stdout, err) = CliRunner.Run("features", "--preset", "wb1996");
        Assert.True(exit == 0, err);
        using var doc = JsonDocument.Parse(stdout);
        var r = doc.RootElement.GetProperty("readouts");
        foreach (var name in new[]
            { "resting_potential", "input_resistance", "membrane_time_constant", "sag_ratio", "rheobase", "spike_threshold", "spike_peak",
            "spike_amplitude", "spike_half_width", "after_hyperpolarisation", "first_spike_latency", "fi_gain", "excitability_class", "adaptation_ratio",
            "adaptation_index", "depolarisation_block_onset" })
            Assert.True(r.TryGetProperty(name, out _), name);
        // Wang & Buzsaki 1996: class 1.
        Assert.Equal(1, r.GetProperty("excitability_class").GetProperty("value").GetDouble());
        Assert.Contains("clinical", doc.RootElement.GetProperty("caution").GetString());
    }

    [Fact]
    public void SimulateWritesTraceWithChannelCurrents()
    {
        var (exit, stdout, err) =
            CliRunner.Run("simulate", "--preset", "hh1952", "--amplitude", "10", "--duration", "50", "--delay", "10", "--total", "60", "--currents");
        Assert.True(exit == 0, err);
        var lines = stdout.Split('\n', StringSplitOptions.RemoveEmptyEntries).Where(l => !l.StartsWith('#')).ToArray();
        Assert.Equal("time_ms,voltage_mv,stimulus_ua_per_cm2,"
            + "current_squid-na-hh1952_ua_per_cm2,current_squid-k-hh1952_ua_per_cm2,current_squid-leak-hh1952_ua_per_cm2", lines[0]);
        var peak = lines.Skip(1).Max(l => double.Parse(l.Split(',')[1], CultureInfo.InvariantCulture));
        Assert.True(peak > 20, $"peak {peak}");
    }

    [Fact]
    public void VoltageClampReportsSodiumInwardAndPotassiumOutward()
    {
        var (exit, stdout, err) = CliRunner.Run("clamp-steps", "--preset", "hh1952", "--holding", "-80", "--from", "-40", "--to", "0", "--step", "20");
        Assert.True(exit == 0, err);
        var lines = stdout.Split('\n', StringSplitOptions.RemoveEmptyEntries).Where(l => !l.StartsWith('#')).ToArray();
        var header = lines[0].Split(',');
        var at0 = lines.Last().Split(',');
        double na = double.Parse(at0[Array.IndexOf(header, "peak_squid-na-hh1952_ua_per_cm2")], CultureInfo.InvariantCulture);
        double k = double.Parse(at0[Array.IndexOf(header, "steady_squid-k-hh1952_ua_per_cm2")], CultureInfo.InvariantCulture);
        Assert.True(na < 0 && k > 0, $"Na {na}, K {k}");
    }

    [Theory]
    [InlineData("fi --preset nope --to 3", "Unknown preset 'nope'")]
    [InlineData("fi --to 3", "exactly one")]
    [InlineData("fi --preset hh1952 --to 3 --units volts", "Unknown current unit")]
    [InlineData("simulate --preset hh1952 --protocol zigzag", "unknown protocol")]
    [InlineData("features missing-file.json", "no such model file")]
    public void BadInvocationsFailWithAClearMessage(string line, string expected)
    {
        var (exit, _, err) = CliRunner.Run(line.Split(' '));
        Assert.NotEqual(0, exit);
        Assert.Contains(expected, err);
    }

    [Fact]
    public void BadModelFileNamesLineAndField()
    {
        var path = Path.Combine(Path.GetTempPath(), $"bad-model-{Guid.NewGuid():N}.json");
        File.WriteAllText(path, "{\n  \"format\": \"exprmodel-model\",\n  \"schemaVersion\": 1,\n  \"cell\": { \"areaUm2\": 1000 },\n  \"channels\": " +
            "[ { \"entry\": \"leak\", \"densityMsPerCm2\": \"lots\" } ]\n}\n");
        var (exit, _, err) = CliRunner.Run("features", path);
        Assert.NotEqual(0, exit);
        Assert.Contains(Path.GetFileName(path), err);
        Assert.Contains("line 5", err);
        Assert.Contains("densityMsPerCm2", err);
        File.Delete(path);
    }

    [Fact]
    public void MechanismsNamesTheMCurrentAsBuildingUpOnTheRegularSpikingPreset()
    {
        // Pospischil et al. 2008: the regular-spiking model adapts through its M-current (common practice: it builds up over a train).
        var (exit, stdout, err) = CliRunner.Run("mechanisms", "--preset", "cortex-rs2008", "--format", "json");
        Assert.True(exit == 0, err);
        using var doc = JsonDocument.Parse(stdout);
        var root = doc.RootElement;
        Assert.Equal("kv7-m-yamada", root.GetProperty("building_up").GetString());
        Assert.Contains("clinical", root.GetProperty("caution").GetString());
        Assert.True(root.GetProperty("spikes").GetArrayLength() >= 10);
        Assert.True(root.GetProperty("after_train").GetProperty("ratio").GetDouble() > 1);

        var csv = CliRunner.Run("mechanisms", "--preset", "cortex-rs2008", "--units", "pA", "--amplitude", "600");
        Assert.True(csv.Exit == 0, csv.Err);
        Assert.Contains("Research tool", csv.Out);
        var header = csv.Out.Split('\n').First(l => !l.StartsWith('#')).Split(',');
        Assert.Equal(["spike", "time_ms", "threshold_mv", "trough_mv", "ahp_depth_mv", "interval_ms"], header.Take(6));
        Assert.Contains("ramp_current_kv7-m-yamada_pa", header);
    }

    [Fact]
    public void MechanismsRefusesABadProbeWidthNamingTheOption()
    {
        var (exit, _, err) = CliRunner.Run("mechanisms", "--preset", "hh1952", "--probe-width", "0", "--amplitude", "10");
        Assert.Equal(1, exit);
        Assert.Contains("--probe-width", err);
    }

    [Fact]
    public void MethodsWritesTheParagraphAndABibTexFileCitingEveryChannel()
    {
        var bib = Path.Combine(Path.GetTempPath(), $"exprmodel-methods-{Guid.NewGuid():N}.bib");
        try
        {
            var (exit, stdout, err) = CliRunner.Run("methods", "--preset", "wb1996", "--bibtex", bib);
            Assert.True(exit == 0, err);
            // Wang & Buzsaki 1996 (J Neurosci 16:6402): the preset's sodium and potassium entries cite it.
            Assert.Contains("[Wang1996]", stdout);
            Assert.Contains("at 35 mS/cm2", stdout);
            Assert.Contains("clinical", stdout);
            string text = File.ReadAllText(bib);
            Assert.Contains("@article{Wang1996,", text);
            Assert.Contains("pages = {6402--6413}", text);
            var viaFormat = CliRunner.Run("methods", "--preset", "wb1996", "--format", "bibtex");
            Assert.Equal(text, viaFormat.Out);
        }
        finally
        {
            File.Delete(bib);
        }
    }
}
