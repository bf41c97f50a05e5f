using ExprModel.Core.Analysis;
using ExprModel.Core.Export;
using ExprModel.Core.Mapping;
using ExprModel.Core.Models;

namespace ExprModel.Core.Tests.Export;

public class CsvTableTests
{
    public static TheoryData<string> Probes() => [.. FormulaProbes.All];

    [Theory]
    [MemberData(nameof(Probes))]
    public void Every_line_of_a_table_is_inert_whatever_the_cells_and_comments_hold(string probe)
    {
        var csv = new CsvTable([probe, "source: " + probe, "model: " + probe], ["name", probe, "value"]);
        csv.Row(probe, probe, -65.2).Row("x", "y", 1e-3);
        FormulaProbes.AssertInert(csv.ToString(), $"CsvTable with '{probe}'");
    }

    [Theory]
    [MemberData(nameof(Probes))]
    public void Trace_fi_and_batch_exports_are_inert_for_a_hostile_model_or_source_name(string probe)
    {
        FormulaProbes.AssertInert(TraceCsv.Write(probe, [0, 0.025], [-65, -64.9], [0, 1], 0), "trace");
        FormulaProbes.AssertInert(FiCsv.Write(probe, [new FiPoint(-1, 0, 0, 0, 0, null), new FiPoint(2, 3, 6, 10, 5, 12.5)]), "f-I");
        var batch = BatchTable.Create([new BatchRow(0, probe, 3, null, [], probe)], [ResearchCaution.Text, "source: " + probe + "; shard 1/1 of 1 items"]);
        FormulaProbes.AssertInert(batch.ToString(), "batch");
    }

    [Fact]
    public void The_probes_are_live_when_written_raw_so_the_check_can_fail()
    {
        // The check itself must catch what it is for: a raw comment line and an unquoted ';' cell.
        Assert.ThrowsAny<Exception>(() => FormulaProbes.AssertInert("# model: x,=HYPERLINK(\"a\")\nh\n1\n", "raw"));
        Assert.ThrowsAny<Exception>(() => FormulaProbes.AssertInert("name\na;=1+1\n", "raw"));
        Assert.ThrowsAny<Exception>(() => FormulaProbes.AssertInert("name\n-1+1\n", "raw"));
    }

    [Fact]
    public void Comments_keep_their_text_and_only_gain_a_quote_where_a_cell_would_start_a_formula()
    {
        Assert.Equal("# model: x,'=HYPERLINK(1)", CsvTable.Comment("model: x,=HYPERLINK(1)"));
        Assert.Equal("# a;'=1+1", CsvTable.Comment("a;=1+1"));
        Assert.Equal("# a, \"'=1\"", CsvTable.Comment("a, \"=1\""));
        Assert.Equal("# spikes: 3 of 4, rate 2 Hz", CsvTable.Comment("spikes: 3 of 4, rate 2 Hz"));
        Assert.Equal("# one two", CsvTable.Comment("one\ntwo"));
        Assert.Equal(CsvTable.Comment("x,'=1"), CsvTable.Comment(CsvTable.Comment("x,=1")[2..]));
    }

    [Fact]
    public void Cells_with_a_semicolon_or_tab_are_quoted_and_neutralised_and_numbers_stay_numbers()
    {
        Assert.Equal("\"a;'=1+1\"", CsvTable.Cell("a;=1+1"));
        Assert.Equal("\"b\t1\"", CsvTable.Cell("b\t1"));
        Assert.Equal("\"GENE1;GENE2\"", CsvTable.Cell("GENE1;GENE2"));
        Assert.Equal("-65.2", CsvTable.Cell(-65.2));
        Assert.Equal("'-1+1", CsvTable.Cell("-1+1"));
    }

    [Fact]
    public void A_plain_number_is_data_and_a_comma_inside_a_quoted_cell_starts_no_formula()
    {
        // OWASP's CSV-injection guidance neutralises cells starting with = + - @ tab CR; a plain number such as -90 is read
        // by every spreadsheet as the number it is, so it stays as written, like the numeric cells.
        Assert.Equal("-90", CsvTable.Cell("-90"));
        Assert.Equal("-1.5e3", CsvTable.Cell("-1.5e3"));
        // A cell starting with '-' that is not a number is read as a formula: it keeps its quote.
        Assert.Equal("'-90 pA", CsvTable.Cell("-90 pA"));
        Assert.Equal("'-1.5e3x", CsvTable.Cell("-1.5e3x"));
        // Inside a quoted cell a comma is not a separator for any spreadsheet, so a note is written as it is ...
        Assert.Equal("\"The most hyperpolarising step (sweep 1, -90 pA) reaches -11.1 mV\"",
            CsvTable.Cell("The most hyperpolarising step (sweep 1, -90 pA) reaches -11.1 mV"));
        // ... while a semicolon or tab inside it still starts a cell for a semicolon- or tab-locale spreadsheet.
        Assert.Equal("\"sweep 1; '-90 pA\"", CsvTable.Cell("sweep 1; -90 pA"));
        var csv = new CsvTable([], ["note", "value"]).Row("-90", -90.0).Row("(sweep 1, -90 pA)", 1).Row("sweep 1; -90 pA", 2).ToString();
        FormulaProbes.AssertInert(csv, "notes with negative currents");
        // A comment line is not quoted: a comma-splitting spreadsheet starts a cell after its commas.
        Assert.Equal("# sweep 1, '-90 pA", CsvTable.Comment("sweep 1, -90 pA"));
    }

    [Fact]
    public void Rewriting_a_line_this_writer_produced_changes_nothing_and_neutralises_a_hand_edited_one()
    {
        var line = new CsvTable([], ["a", "b", "c", "d"]).Row(3, "x,=1", -0.5, "'=2").ToString().Split('\n')[1];
        Assert.Equal(line, CsvTable.Line(line));
        Assert.Equal("1,'=cmd,\"'@x;y\",-2.5e-3", CsvTable.Line("1,=cmd,@x;y,-2.5e-3"));
    }
}
