using ExprModel.Core.Export;

namespace ExprModel.Core.Tests.Export;

public class ReadoutTablesTests
{
    private static readonly (string Name, string Unit, double? Value)[] Measured =
    [
        ("resting_potential", "mV", -71.25),
        ("rheobase", "uA/cm2", 9.944),
        ("fi_gain", "Hz per uA/cm2", double.NaN),
        ("sag_ratio", "", null),
    ];

    [Fact]
    public void ALastDigitDifferenceIsNoChangeButIsNotIdentical()
    {
        var nudged = Measured.Select(r => r with { Value = r.Value * (1 + 1e-13) }).ToArray();
        Assert.Empty(ReadoutTables.Changes(Measured, nudged));
        Assert.False(ReadoutTables.Identical(Measured, nudged));
        Assert.True(ReadoutTables.Identical(Measured, Measured.ToArray()));
        // Asked for bit equality, the nudge is a change (NaN and absent values still match themselves).
        Assert.Equal(["resting_potential", "rheobase"], ReadoutTables.Changes(Measured, nudged, 0).Select(c => c.Name));
    }

    [Fact]
    public void IdenticalNeedsTheSameRowsInTheSameOrder()
    {
        Assert.False(ReadoutTables.Identical(Measured, Measured.Reverse().ToArray()));
        Assert.False(ReadoutTables.Identical(Measured, Measured[..3]));
    }

    [Fact]
    public void ChangedVanishedAndNewValuesAreListedInTheSecondTablesOrder()
    {
        (string, string, double?)[] stored = [("sag_ratio", "", 0.2), ("rheobase", "uA/cm2", null), ("resting_potential", "mV", -71.25)];
        Assert.Equal([new ReadoutChange("sag_ratio", "", null, 0.2), new ReadoutChange("rheobase", "uA/cm2", 9.944, null)],
            ReadoutTables.Changes(Measured, stored));
    }
}
