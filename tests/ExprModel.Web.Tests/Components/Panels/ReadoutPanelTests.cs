using Bunit;
using ExprModel.Web.Components.Panels;
using ExprModel.Web.Simulation;
using ExprModel.Web.Workspace;

namespace ExprModel.Web.Tests.Components.Panels;

public sealed class ReadoutPanelTests : BunitContext
{
    [Fact]
    public void One_row_per_readout_and_one_column_per_variant()
    {
        ReadoutRow[] a = [new("rheobase", "uA/cm2", 0.16), new("excitability_class", "1 or 2", 1), new("adaptation_ratio", "last/first ISI", null)];
        ReadoutRow[] b = [new("rheobase", "uA/cm2", 7.25), new("excitability_class", "1 or 2", 2)];
        var cut = Render<ReadoutPanel>(p => p.Add(x => x.Columns, [new ReadoutPanel.Column("#1", "#c8553d", a), new ReadoutPanel.Column("now", "#1d2a36", b)])
            .Add(x => x.UpdateCount, 3));
        Assert.Equal(["Read-out", "#1", "now", "Unit"], cut.FindAll("thead th").Select(t => t.TextContent));
        var rows = cut.FindAll("tbody tr");
        Assert.Equal(3, rows.Count);
        var rheo = cut.Find("tr[data-readout=rheobase]").QuerySelectorAll("td").Select(t => t.TextContent).ToArray();
        Assert.Equal(["rheobase", "0.16", "7.25", "uA/cm2"], rheo);
        // Missing values (null, or absent for a variant) are a dash, never a zero.
        var adapt = cut.Find("tr[data-readout=adaptation_ratio]").QuerySelectorAll("td").Select(t => t.TextContent).ToArray();
        Assert.Equal("—", adapt[1]);
        Assert.Equal("—", adapt[2]);
        Assert.Equal("3", cut.Find("section").GetAttribute("data-update"));
    }

    [Fact]
    public void Readouts_still_being_measured_show_an_ellipsis_not_a_value()
    {
        ReadoutRow[] first = [new("rheobase", "uA/cm2", 0.16), new("excitability_class", "1 or 2", null)];
        var pending = new HashSet<string> { "excitability_class" };
        var cut = Render<ReadoutPanel>(p => p.Add(x => x.Columns, [new ReadoutPanel.Column("now", "#1d2a36", first, pending)])
            .Add(x => x.UpdateCount, 2).Add(x => x.CompleteCount, 1));
        var cls = cut.Find("tr[data-readout=excitability_class]").QuerySelectorAll("td");
        Assert.Equal("…", cls[1].TextContent);
        Assert.Contains("pending", cls[1].ClassName);
        Assert.Equal("0.16", cut.Find("tr[data-readout=rheobase]").QuerySelectorAll("td")[1].TextContent);
        Assert.Equal("2", cut.Find("section").GetAttribute("data-update"));
        Assert.Equal("1", cut.Find("section").GetAttribute("data-complete-update"));
    }

    [Fact]
    public void Nothing_to_show_says_so()
    {
        var cut = Render<ReadoutPanel>();
        Assert.Contains("No read-outs yet", cut.Markup);
        Assert.Empty(cut.FindAll("table"));
    }

    [Theory]
    [InlineData(-64.0175643, "-64.02")]
    [InlineData(1217.70488, "1218")]
    [InlineData(0.0012345, "0.001235")]
    [InlineData(0.0, "0")]
    public void Numbers_of_unnamed_unit_are_shown_to_four_digits(double value, string shown) => Assert.Equal(shown, ReadoutPanel.Format(value));

    [Fact]
    public void Tiny_values_show_as_zero_at_their_read_out_resolution()
    {
        // A sag ratio of 1.4e-12 is no sag; it must not appear as "1.369E-12".
        var rows = new List<ReadoutRow> { new("sag_ratio", "fraction", 1.369e-12), new("resting_potential", "mV", -64.0175643) };
        var cut = Render<ReadoutPanel>(p => p.Add(x => x.Columns, [new ReadoutPanel.Column("now", "#000", rows)]));
        Assert.Equal("0", cut.Find("tr[data-readout=sag_ratio] td.num").TextContent);
        Assert.Equal("-64.02", cut.Find("tr[data-readout=resting_potential] td.num").TextContent);
        Assert.DoesNotContain("E-", cut.Markup);
    }
}

public sealed class ErrorNoteTests : BunitContext
{
    [Fact]
    public void Shows_the_message_as_an_alert()
    {
        var cut = Render<ErrorNote>(p => p.Add(x => x.Message, "counts.csv: line 4, column 3: 'abc' is not a number")
            .Add(x => x.Title, "This file cannot be used"));
        Assert.Equal("alert", cut.Find("div").GetAttribute("role"));
        Assert.Contains("line 4, column 3", cut.Markup);
        Assert.Contains("This file cannot be used", cut.Markup);
    }

    [Fact]
    public void No_message_renders_nothing() => Assert.Equal("", Render<ErrorNote>().Markup.Trim());

    [Fact]
    public void A_recorded_column_shows_a_cells_value_or_a_groups_mean_sd_and_n_with_the_difference_from_now()
    {
        ReadoutRow[] now = [new("rheobase_absolute", "pA", 150), new("resting_potential", "mV", -70), new("spike_half_width", "ms", 0.4)];
        var recorded = new Dictionary<string, RecordedValue>
        {
            ["rheobase_absolute"] = new("rheobase_absolute", "pA", 160, 12.5, 5, "'rheobase (pA)'"),
            ["resting_potential"] = new("resting_potential", "mV", -68, null, 2, "sweeps"),
        };
        var column = new ReadoutPanel.Column("now", "#1d2a36", now);
        var cut = Render<ReadoutPanel>(p => p.Add(x => x.Columns, [column]).Add(x => x.Recorded, recorded).Add(x => x.RecordedLabel,
            "group T1-fast").Add(x => x.Against, column));
        Assert.Equal(["Read-out", "now", "recorded (group T1-fast)", "now − recorded", "Unit"], cut.FindAll("thead th").Select(t => t.TextContent));
        var rheo = cut.Find("tr[data-readout=rheobase_absolute]").QuerySelectorAll("td").Select(t => t.TextContent).ToArray();
        Assert.Equal(["rheobase absolute", "150", "160 ± 12.5 (n 5)", "-10", "pA"], rheo);
        // Below three cells there is no SD (as the z-scores use it); a read-out nobody recorded is a dash, with no difference.
        Assert.Equal("-68 (n 2)", cut.Find("tr[data-readout=resting_potential] [data-testid=recorded-value]").TextContent);
        var width = cut.Find("tr[data-readout=spike_half_width]").QuerySelectorAll("td").Select(t => t.TextContent).ToArray();
        Assert.Equal(["—", "—"], width[2..4]);
    }

    [Fact]
    public void Without_recorded_values_the_table_has_no_recorded_column()
    {
        var cut = Render<ReadoutPanel>(p => p.Add(x => x.Columns, [new ReadoutPanel.Column("now", "#1d2a36", [new("rheobase", "uA/cm2", 1.0)])]));
        Assert.Empty(cut.FindAll("[data-testid=recorded-head]"));
    }
}
