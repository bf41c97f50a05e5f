using BenchmarkDotNet.Attributes;
using ExprModel.Core.Analysis;
using ExprModel.Core.Simulation;
using ExprModel.Data.Catalog;

namespace ExprModel.Benchmarks;

/// <summary>BenchmarkDotNet suite for the same workloads (run with --bdn).</summary>
[MemoryDiagnoser]
public class SimulatorBenchmarks
{
    private CompiledCell _cell = null!;

    [Params("hh1952", "cortex-rs2008")]
    public string Preset { get; set; } = "hh1952";

    [GlobalSetup]
    public void Setup()
    {
        var catalog = CatalogLocator.Ensure();
        _cell = new CompiledCell(catalog.BuildCell(catalog.Preset(Preset)));
        Simulator.Run(_cell, Protocols.Step(1, 0, 10), 10);
    }

    [Benchmark]
    public int OneSecond() => Simulator.Run(_cell, Protocols.Step(10, 0, 1000), 1000, SimulationSettings.SpikesOnly).SpikeTimesMs.Count;

    [Benchmark]
    public int FiCurve32() => FiCurve.Measure(_cell, 0, Preset == "hh1952" ? 19.375 : 4.0, 32, 1000).Sum(p => p.SpikesInStep);
}
