namespace ExprModel.Core.Export;

/// <summary>One BibTeX record: type (article, incollection, misc), unique key and its fields in order (values unescaped).</summary>
public sealed record BibEntry(string Type, string Key, IReadOnlyList<KeyValuePair<string, string>> Fields);
