using System.Reflection;

namespace ExprModel.Core.Export;

/// <summary>The versions a methods paragraph names: the program's and the channel catalog's (schema and source content hash).</summary>
public sealed record MethodsVersions(string Software, string Catalog)
{
    /// <summary>This build's version (the library's informational version, without a source-link suffix) with the given catalog label.</summary>
    public static MethodsVersions Current(string catalogLabel)
    {
        var info = typeof(MethodsVersions).Assembly.GetCustomAttribute<AssemblyInformationalVersionAttribute>()?.InformationalVersion ?? "unknown";
        return new MethodsVersions(info.Split('+')[0], catalogLabel);
    }
}
