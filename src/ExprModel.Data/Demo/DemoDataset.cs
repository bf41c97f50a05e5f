namespace ExprModel.Data.Demo;

/// <summary>The generated files' contents.</summary>
public sealed record DemoDataset(string CountsCsv, string MetadataCsv);
