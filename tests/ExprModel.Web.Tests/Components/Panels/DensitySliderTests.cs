using Bunit;
using ExprModel.Web.Components.Panels;
using Microsoft.AspNetCore.Components;

namespace ExprModel.Web.Tests.Components.Panels;

public sealed class DensitySliderTests : BunitContext
{
    [Theory]
    [InlineData(0.0)]
    [InlineData(0.01)]
    [InlineData(0.5)]
    [InlineData(1.0)]
    [InlineData(2.5)]
    [InlineData(4.0)]
    public void The_log_scale_maps_positions_and_values_both_ways(double relative)
    {
        int pos = DensityScale.PositionOf(relative);
        Assert.InRange(pos, 0, DensityScale.Positions);
        // One position step is a 0.6% change on a log scale from 1% to 400%.
        if (relative == 0) Assert.Equal(0, DensityScale.RelativeAt(pos));
        else Assert.Equal(relative, DensityScale.RelativeAt(pos), relative * 0.004);
    }

    [Fact]
    public void The_scale_ends_at_off_and_400_percent_and_is_monotonic()
    {
        Assert.Equal(0, DensityScale.RelativeAt(0));
        Assert.Equal(4.0, DensityScale.RelativeAt(DensityScale.Positions), 12);
        for (int p = 1; p < DensityScale.Positions; p++) Assert.True(DensityScale.RelativeAt(p + 1) > DensityScale.RelativeAt(p));
    }

    [Fact]
    public void Shows_percent_and_absolute_density_and_reports_a_moved_slider()
    {
        double? reported = null;
        var cut = Render<DensitySlider>(p => p
            .Add(x => x.EntryId, "wb-k-1996").Add(x => x.Label, "Kdr").Add(x => x.BaseDensityMsPerCm2, 9)
            .Add(x => x.Relative, 1.0).Add(x => x.RelativeChanged, EventCallback.Factory.Create<double>(this, v => reported = v)));
        Assert.Equal("100%", cut.Find("output").TextContent);
        Assert.Contains("9 mS/cm²", cut.Find(".absolute").TextContent);
        Assert.True(cut.Find("button").HasAttribute("disabled"));

        cut.Find("input[type=range]").Input("1000");
        Assert.Equal(4.0, reported!.Value, 9);
        cut.Find("input[type=range]").Input("0");
        Assert.Equal(0, reported!.Value);
    }

    [Fact]
    public void Reset_returns_to_as_expressed()
    {
        double? reported = null;
        var cut = Render<DensitySlider>(p => p
            .Add(x => x.EntryId, "leak").Add(x => x.Label, "leak").Add(x => x.BaseDensityMsPerCm2, 0.1)
            .Add(x => x.Relative, 0.25).Add(x => x.RelativeChanged, EventCallback.Factory.Create<double>(this, v => reported = v)));
        Assert.Equal("25%", cut.Find("output").TextContent);
        Assert.False(cut.Find("button").HasAttribute("disabled"));
        cut.Find("button").Click();
        Assert.Equal(1.0, reported);
    }

    [Fact]
    public void Off_is_shown_as_off()
    {
        var cut = Render<DensitySlider>(p => p.Add(x => x.EntryId, "leak").Add(x => x.Label, "leak").Add(x => x.Relative, 0.0));
        Assert.Equal("off", cut.Find("output").TextContent);
        Assert.Equal("0", cut.Find("input").GetAttribute("value"));
    }
}
