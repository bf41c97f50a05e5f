namespace ExprModel.Web.Hosting;

/// <summary>Finds the static-file root: the checkout's top-level wwwroot, else the copy next to the program.</summary>
public static class WebRoot
{
    public static string Locate()
    {
        foreach (var start in new[] { Directory.GetCurrentDirectory(), AppContext.BaseDirectory })
        {
            for (var d = new DirectoryInfo(start); d is not null; d = d.Parent)
            {
                var candidate = Path.Combine(d.FullName, "wwwroot");
                if (File.Exists(Path.Combine(d.FullName, "ExprModel.sln")) && Directory.Exists(candidate)) return candidate;
            }
        }
        return Path.Combine(AppContext.BaseDirectory, "wwwroot");
    }
}
