using ExprModel.Core.Simulation;
using ExprModel.Data.Catalog;

namespace ExprModel.Core.Tests;

/// <summary>The repository's catalog, built once per test run into a temporary database.</summary>
public static class TestCatalog
{
    private static readonly Lazy<ChannelCatalog> Shared = new(() =>
    {
        var dir = CatalogLocator.FindSourceDirectory() ?? throw new InvalidOperationException("catalog/ not found above the test directory");
        var db = Path.Combine(Path.GetTempPath(), $"exprmodel-core-tests-{Environment.ProcessId}.db");
        return CatalogLocator.Ensure(db, CatalogSources.FromDirectory(dir));
    });

    public static ChannelCatalog Catalog => Shared.Value;

    public static CompiledCell Preset(string id) => new(Catalog.Preset(id).ToCellModel(Catalog.Resolve));
}
