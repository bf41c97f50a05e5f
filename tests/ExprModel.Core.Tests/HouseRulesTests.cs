using System.Text.RegularExpressions;

namespace ExprModel.Core.Tests;

/// <summary>
/// The house rules of the contributor guide that a machine can check, over the whole checkout: tests mirror the source
/// tree folder by folder, source files hold one top-level type named after the file, and no line passes the
/// .editorconfig limit.
/// </summary>
public sealed class HouseRulesTests
{
    private static readonly string Root = FindRoot();

    private static string FindRoot()
    {
        for (var dir = new DirectoryInfo(AppContext.BaseDirectory); dir is not null; dir = dir.Parent)
        {
            if (File.Exists(Path.Combine(dir.FullName, "ExprModel.sln"))) return dir.FullName;
        }
        throw new InvalidOperationException("ExprModel.sln not found above the test directory");
    }

    /// <summary>A path relative to the checkout, with '/' separators.</summary>
    private static string Relative(string path) => Path.GetRelativePath(Root, path).Replace('\\', '/');

    private static IEnumerable<string> Files(string top, params string[] patterns) =>
        patterns.SelectMany(p => Directory.EnumerateFiles(Path.Combine(Root, top), p, SearchOption.AllDirectories))
            .Where(f => !f.Contains($"{Path.DirectorySeparatorChar}bin{Path.DirectorySeparatorChar}")
                     && !f.Contains($"{Path.DirectorySeparatorChar}obj{Path.DirectorySeparatorChar}"));

    [Fact]
    public void Every_test_folder_mirrors_a_source_folder_and_every_test_sits_beside_its_source_file()
    {
        var misplaced = new List<string>();
        foreach (var project in Directory.EnumerateDirectories(Path.Combine(Root, "tests"), "ExprModel.*.Tests"))
        {
            string name = Path.GetFileName(project);
            string source = Path.Combine(Root, "src", name[..^".Tests".Length]);
            // End-to-end tests drive the running app as a whole; they have no source folder of their own.
            if (!Directory.Exists(source)) continue;
            // Folders (relative to the project) of each source file stem: X.cs and X.razor both name the stem X.
            var folders = Files(Path.GetRelativePath(Root, source), "*.cs", "*.razor")
                .Where(f => !f.EndsWith(".razor.cs", StringComparison.Ordinal))
                .GroupBy(f => Path.GetFileNameWithoutExtension(f), StringComparer.Ordinal)
                .ToDictionary(g => g.Key, g => g.Select(f => Path.GetDirectoryName(Path.GetRelativePath(source, f)) ?? "").ToHashSet(),
                    StringComparer.Ordinal);
            foreach (var file in Files(Path.GetRelativePath(Root, project), "*Tests.cs"))
            {
                string folder = Path.GetDirectoryName(Path.GetRelativePath(project, file)) ?? "";
                string stem = Path.GetFileNameWithoutExtension(file)[..^"Tests".Length];
                if (folder.Length > 0 && !Directory.Exists(Path.Combine(source, folder)))
                    misplaced.Add($"{Relative(file)}: no folder src/{Path.GetFileName(source)}/{folder}");
                else if (folders.TryGetValue(stem, out var homes) && !homes.Contains(folder))
                    misplaced.Add($"{Relative(file)}: tests {stem}, which sits in src/{Path.GetFileName(source)}/{string.Join(" or ", homes)}");
            }
        }
        Assert.True(misplaced.Count == 0, string.Join("\n", misplaced));
    }

    /// <summary>max_line_length of the .editorconfig section that covers C# files.</summary>
    private static int MaxLineLength()
    {
        string? section = null;
        foreach (var raw in File.ReadAllLines(Path.Combine(Root, ".editorconfig")))
        {
            string line = raw.Trim();
            if (line.StartsWith('[')) section = line;
            else if (section is not null && Regex.IsMatch(section, @"\bcs\b")
                     && Regex.Match(line, @"^max_line_length\s*=\s*(\d+)$") is { Success: true } m)
                return int.Parse(m.Groups[1].Value, System.Globalization.CultureInfo.InvariantCulture);
        }
        throw new InvalidOperationException(".editorconfig sets no max_line_length for *.cs");
    }

    [Fact]
    public void No_line_passes_the_editorconfig_limit()
    {
        int limit = MaxLineLength();
        var long_ = new List<string>();
        foreach (var file in Files("src", "*.cs", "*.razor").Concat(Files("tests", "*.cs", "*.razor")))
        {
            var lines = File.ReadAllLines(file);
            for (int i = 0; i < lines.Length; i++)
            {
                if (lines[i].Length > limit) long_.Add($"{Relative(file)}:{i + 1} ({lines[i].Length} characters)");
            }
        }
        Assert.True(long_.Count == 0, $"{long_.Count} lines over {limit} characters:\n" + string.Join("\n", long_.Take(40)));
    }

    private static readonly Regex TopLevelType = new(
        @"^(?:public |internal )?(?:static |sealed |abstract |readonly |partial |file |unsafe )*(?:record struct|record|class|struct|interface|enum) (\w+)",
        RegexOptions.Multiline);

    [Fact]
    public void Every_source_file_holds_one_top_level_type_named_after_it()
    {
        var wrong = new List<string>();
        foreach (var file in Files("src", "*.cs"))
        {
            string stem = Path.GetFileNameWithoutExtension(file);
            if (stem is "Program" or "Usings" || stem.EndsWith(".razor", StringComparison.Ordinal)) continue;
            var types = TopLevelType.Matches(File.ReadAllText(file)).Select(m => m.Groups[1].Value).Distinct().ToList();
            if (types.Count == 0) continue;
            if (types.Count > 1 || types[0] != stem)
                wrong.Add($"{Relative(file)}: {string.Join(", ", types)}");
        }
        Assert.True(wrong.Count == 0, $"{wrong.Count} files:\n" + string.Join("\n", wrong));
    }
}
