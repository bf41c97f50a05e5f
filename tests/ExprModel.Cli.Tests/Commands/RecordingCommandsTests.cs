using System.Text.Json;
using ExprModel.Core.Recordings;

namespace ExprModel.Cli.Tests.Commands;

/// <summary>exprmodel recording features on recordings written by our NWB writer (analytic RC sweeps: R = dV / I).</summary>
public sealed class RecordingCommandsTests : IDisposable
{
    private readonly string _dir = Directory.CreateTempSubdirectory("exprmodel-rec-cli-").FullName;
    public void Dispose() => Directory.Delete(_dir, true);

    /// <summary>Passive RC sweeps (textbook identity V = V0 + R I (1 - exp(-t / tau))) at -20 and -40 pA, R = 150 MOhm, tau = 10 ms, 20 kHz.</summary>
    private string WriteCell(string id)
    {
        const double dt = 0.05;
        var sweeps = new[] { -20.0, -40 }.Select((a, k) =>
        {
            int n = (int)(700 / dt);
            var v = new double[n];
            var i = new double[n];
            for (int s = 0; s < n; s++)
            {
                double t = s * dt;
                bool on = t >= 100 && t < 600;
                i[s] = on ? a : 0;
                v[s] = -70 + (on ? 150 * a / 1000 * (1 - Math.Exp(-(t - 100) / 10)) : t >= 600 ? 150 * a / 1000 * Math.Exp(-(t - 600) / 10) : 0);
            }
            return RecordedSweep.Create(k + 1, dt, v, i, id);
        }).ToArray();
        var path = Path.Combine(_dir, id + ".nwb");
        NwbWriter.Write(path, new NwbSession { Identifier = id, Cells = [new RecordedCell { CellId = id, Source = id, Sweeps = sweeps }] });
        return path;
    }

    [Fact]
    public void Csv_OneRowPerCell_InTheBatchHeaderStyle()
    {
        WriteCell("c1");
        WriteCell("c2");
        var (exit, stdout, err) = CliRunner.Run("recording", "features", _dir);
        Assert.True(exit == 0, err);
        var lines = stdout.Split('\n', StringSplitOptions.RemoveEmptyEntries);
        Assert.StartsWith("# Recorded read-outs: measurements", lines[0]);
        var header = lines[2].Split(',');
        Assert.Equal(["item_index", "item", "source", "resting_potential_mv"], header[..4]);
        Assert.Contains("input_resistance_mohm", header);
        Assert.Contains("rheobase_step_spacing_pa", header);
        var row = lines[3].Split(',');
        Assert.Equal("c1", row[1]);
        Assert.Equal(150, double.Parse(row[Array.IndexOf(header, "input_resistance_mohm")], System.Globalization.CultureInfo.InvariantCulture), 6);
        Assert.Equal(-70, double.Parse(row[Array.IndexOf(header, "resting_potential_mv")], System.Globalization.CultureInfo.InvariantCulture), 4);
    }

    [Fact]
    public void Json_CarriesValuesUnitsAndNotes()
    {
        var path = WriteCell("c3");
        var (exit, stdout, err) = CliRunner.Run("recording", "features", path, "--format", "json");
        Assert.True(exit == 0, err);
        var cell = JsonDocument.Parse(stdout).RootElement.GetProperty("cells")[0];
        Assert.Equal("c3", cell.GetProperty("cell").GetString());
        var tau = cell.GetProperty("readouts").GetProperty("membrane_time_constant");
        Assert.Equal("ms", tau.GetProperty("unit").GetString());
        Assert.Equal(10, tau.GetProperty("value").GetDouble(), 6);
        Assert.Contains(cell.GetProperty("notes").EnumerateArray(), n => n.GetString()!.Contains("rheobase is not defined")
            || n.GetString()!.Contains("No usable depolarising step"));
    }

    [Fact]
    public void BadFile_IsAnErrorNamingTheFile()
    {
        var bad = Path.Combine(_dir, "bad.nwb");
        File.WriteAllText(bad, "not hdf5");
        var (exit, _, err) = CliRunner.Run("recording", "features", bad);
        Assert.Equal(1, exit);
        Assert.Contains("bad.nwb: byte 0: not an HDF5 file", err);
    }
    [Fact]
    public void Overlay_writes_the_recorded_rheobase_sweep_beside_the_models_response()
    {
        var demo = Path.Combine(ExprModel.Data.Catalog.CatalogLocator.FindSourceDirectory()!, "demo", "recordings", "FH1001.nwb");
        var path = Path.Combine(_dir, "overlay.csv");
        var (exit, _, err) = CliRunner.Run("recording", "overlay", demo, "--preset", "wb1996", "--out", path);
        Assert.True(exit == 0, err);
        var lines = File.ReadAllLines(path);
        Assert.Equal("# " + Core.Models.ResearchCaution.Text, lines[0]);
        // FH1001's smallest spiking step is 80 pA, sweep 5 (catalog/demo/recorded-features.csv); 500 ms at 20 kHz.
        Assert.Contains(lines, l => l.Contains("recorded: cell FH1001, sweep 5"));
        Assert.Contains(lines, l => l.StartsWith("# step 80 pA") && l.Contains("from 50 ms for 400 ms"));
        var rows = lines.Where(l => !l.StartsWith('#')).ToArray();
        Assert.Equal("time_ms,recorded_mv,predicted_mv,command_pa", rows[0]);
        Assert.Equal(10001, rows.Length - 1);

        var (exit2, _, err2) = CliRunner.Run("recording", "overlay", demo, "--preset", "wb1996", "--sweep", "7");
        Assert.NotEqual(0, exit2);
        Assert.Contains("no sweep 7", err2); // FH1001's sweep 7 is missing by design
    }
}
