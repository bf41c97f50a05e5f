using ExprModel.Core.Models;
using ExprModel.Web.Export;
using ExprModel.Web.Simulation;

namespace ExprModel.Web.Tests.Export;

public sealed class CsvExportTests
{
    [Fact]
    public void Every_export_starts_with_the_caution()
    {
        var csv = CsvExport.Fi("m", [new FiRow(0, 0, 0, 0, 0), new FiRow(1, 3, 6, 10, 5)]);
        var lines = csv.Split('\n');
        Assert.Equal("# " + ResearchCaution.Text, lines[0]);
        // The command line's f-I layout (FiCsv); the web's rows carry no latency, so its column is blank.
        Assert.Equal("amplitude_ua_per_cm2,spike_count,whole_step_rate_hz,first_isi_rate_hz,late_rate_hz,first_spike_latency_ms", lines[2]);
        Assert.Equal("1,3,6,10,5,", lines[4]);
    }

    [Theory]
    [InlineData("=HYPERLINK(\"x\")", "\"'=HYPERLINK(\"\"x\"\")\"")]
    [InlineData("+1+1", "'+1+1")]
    [InlineData("-2+3", "'-2+3")]
    [InlineData("@SUM(A1)", "'@SUM(A1)")]
    [InlineData("\tx", "\"'\tx\"")]
    [InlineData("plain, with comma", "\"plain, with comma\"")]
    public void Text_cells_a_spreadsheet_would_run_are_neutralised(string variant, string cell)
    {
        var csv = CsvExport.Readouts([(variant, [new ReadoutRow("rheobase", "uA/cm2", -0.5)])]);
        var header = csv.Split('\n')[2];
        Assert.Equal("readout,unit," + cell, header);
        // Numbers stay numbers, even negative ones.
        Assert.Equal("rheobase,uA/cm2,-0.5", csv.Split('\n')[3]);
    }

    public static TheoryData<string> Probes() => [.. ExprModel.Core.Tests.Export.FormulaProbes.All];

    [Theory]
    [MemberData(nameof(Probes))]
    public void Every_line_of_every_web_csv_is_inert_for_a_hostile_model_or_variant_name(string probe)
    {
        ExprModel.Core.Tests.Export.FormulaProbes.AssertInert(CsvExport.Fi(probe, [new FiRow(-1, 0, 0, 0, 0), new FiRow(1, 3, 6, 10, 5)]), "f-I");
        ExprModel.Core.Tests.Export.FormulaProbes.AssertInert(
            CsvExport.Readouts([(probe, [new ReadoutRow("rheobase", "uA/cm2", -0.5)]), ("b" + probe, [new ReadoutRow(probe, probe, 1)])]), "read-outs");
    }

    [Fact]
    public void Variants_sit_side_by_side_with_blanks_for_missing_values()
    {
        var csv = CsvExport.Readouts([("a", [new ReadoutRow("x", "mV", 1), new ReadoutRow("y", "ms", null)]), ("b", [new ReadoutRow("x", "mV", 2)])]);
        var lines = csv.Split('\n');
        Assert.Equal("x,mV,1,2", lines[3]);
        Assert.Equal("y,ms,,", lines[4]);
    }
}
