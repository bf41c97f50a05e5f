using ExprModel.Core.Kinetics;

namespace ExprModel.Core.Tests.Kinetics;

public class TemperatureFactorTests
{
    private static ChannelEntry Entry(double q10, double referenceC) => new()
    {
        Id = "test",
        Version = 1,
        Name = "test",
        Family = "leak",
        Ion = Ion.Potassium,
        Gates = [],
        ReferenceTemperatureC = referenceC,
        Q10 = q10,
        TypicalDensityMsPerCm2 = 1,
        MinDensityMsPerCm2 = 0,
        MaxDensityMsPerCm2 = 2,
        Source = new Citation { Authors = "none", Year = 2000, Journal = "none" },
    };

    [Fact]
    public void Rates_scale_by_q10_per_ten_degrees()
    {
        // Q10 definition (common practice): factor = Q10^((T - T_ref)/10).
        Assert.Equal(3, Entry(3, 26).TemperatureFactor(36), 12);
        Assert.Equal(1, Entry(3, 26).TemperatureFactor(26), 12);
        Assert.Equal(1 / 2.3, Entry(2.3, 23).TemperatureFactor(13), 12);
        Assert.Equal(Math.Sqrt(3), Entry(3, 22).TemperatureFactor(27), 12);
    }

    [Fact]
    public void Squid_axon_rates_at_6_3_C_speed_up_about_26_fold_at_36_C()
    {
        // Hodgkin & Huxley 1952 scale rates by 3^((T - 6.3)/10): at 36 C that is 3^2.97 = 26.1.
        Assert.Equal(26.1, Entry(3, 6.3).TemperatureFactor(36), 1);
    }
}
