using ExprModel.Core.Cell;
using ExprModel.Core.Export;
using ExprModel.Core.Models;
using ExprModel.Core.Simulation;
using ExprModel.Core.Stochastic;

namespace ExprModel.Core.Tests.Export;

public class NoisyTraceCsvTests
{
    [Fact]
    public void The_comment_lines_name_the_method_of_each_channel_type_and_the_threshold()
    {
        // hh1952 on 30 um2: 2,000 sodium and 540 potassium channels. With the threshold at 1,000 sodium takes the diffusion
        // approximation and potassium binomial tracking; the export says so per type, names the threshold and the caution.
        var model = TestCatalog.Preset("hh1952").Model with { Geometry = new Geometry { AreaUm2 = 30 } };
        var cell = new CompiledCell(model);
        var settings = new ChannelNoiseSettings
        {
            UnitaryConductancesPs = ChannelNoise.UnitaryConductances(model, e => TestCatalog.Catalog.UnitaryConductances.For(e).ConductancePs),
            DiffusionFromChannels = 1000,
        };
        var trace = ChannelNoise.Run(cell, new NoCurrent(), 5, settings);
        Assert.Equal([ChannelNoiseMethod.Diffusion, ChannelNoiseMethod.BinomialTracking, ChannelNoiseMethod.Deterministic], trace.Methods);
        string csv = NoisyTraceCsv.Write("hh", model, trace, settings);
        Assert.Contains("squid-na-hh1952 2000 channels of 18 pS (diffusion)", csv);
        Assert.Contains("squid-k-hh1952 540 channels of 20 pS (binomial tracking)", csv);
        Assert.Contains("at least 1000 channels", csv);
        Assert.Contains("Linaro, Storace & Giugliano 2011", csv);
        Assert.Contains(ResearchCaution.Text.Split('.')[0], csv);
    }
}
