using ExprModel.Core.Export;
using ExprModel.Web.Simulation;

namespace ExprModel.Web.Tests.Simulation;

/// <summary>The comparison behind the Workbench's note when a share link's stored read-outs differ from the live table.</summary>
public sealed class ReadoutComparisonTests
{
    private static readonly ReadoutRow[] Live =
    [
        new("resting_potential", "mV", -71.25),
        new("rheobase", "uA/cm2", 9.944),
        new("spike_threshold", "mV", -48.5),
        new("fi_gain", "Hz per uA/cm2", double.NaN),
    ];

    [Fact]
    public void The_same_table_has_no_changes()
    {
        Assert.Empty(ReadoutComparison.Changes(Live, Live));
        // A last-digit difference (another order of floating-point operations) is not a change.
        var nudged = Live.Select(r => r with { Value = r.Value * (1 + 1e-13) }).ToArray();
        Assert.Empty(ReadoutComparison.Changes(Live, nudged));
    }

    [Fact]
    public void A_changed_or_vanished_value_is_listed_with_both_values_in_the_stored_order()
    {
        var stored = new ReadoutRow[]
        {
            new("resting_potential", "mV", -71.25),
            new("rheobase", "uA/cm2", null),
            new("spike_threshold", "mV", -47.9),
            new("fi_gain", "Hz per uA/cm2", double.NaN),
            new("onset_rate", "Hz", 3.5),
        };
        var changes = ReadoutComparison.Changes(Live, stored);
        Assert.Equal(
            [
                new ReadoutChange("rheobase", "uA/cm2", 9.944, null),
                new ReadoutChange("spike_threshold", "mV", -48.5, -47.9),
                new ReadoutChange("onset_rate", "Hz", null, 3.5),
            ],
            changes);
    }
}
