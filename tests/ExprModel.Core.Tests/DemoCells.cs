using ExprModel.Core.Expression;
using ExprModel.Core.Mapping;
using ExprModel.Core.Models;
using ExprModel.Data.Catalog;

namespace ExprModel.Core.Tests;

/// <summary>Models of single cells of the repository's demo data set.</summary>
public static class DemoCells
{
    /// <summary>The demo counts with the groups of its metadata table, as `exprmodel batch --groups group` reads them.</summary>
    public static ExpressionDataset WithGroups()
    {
        var dir = CatalogLocator.FindSourceDirectory()!;
        return ExpressionDataset.Read(TestCatalog.Catalog.ForMapping(), Path.Combine(dir, "demo", "counts.csv"), new ExpressionReadOptions(),
            Path.Combine(dir, "demo", "metadata.csv"), "group");
    }

    /// <summary>A demo cell's model, built as `exprmodel build --cell ID` builds it from the demo counts.</summary>
    public static ModelDocument Model(string id)
    {
        var dir = CatalogLocator.FindSourceDirectory()!;
        var data = ExpressionDataset.Read(TestCatalog.Catalog.ForMapping(), Path.Combine(dir, "demo", "counts.csv"), new ExpressionReadOptions());
        return data.Build(data.Map(), new DensityRule(), ModelTarget.ForCell(id)).Document;
    }
}
