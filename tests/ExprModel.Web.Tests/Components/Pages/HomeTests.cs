using System.Reflection;
using Bunit;
using ExprModel.Data.Catalog;
using ExprModel.Web.Components.Pages;
using ExprModel.Web.Hosting;
using ExprModel.Web.Workspace;
using Microsoft.AspNetCore.Components;
using Microsoft.Extensions.DependencyInjection;
using Microsoft.Extensions.Options;

namespace ExprModel.Web.Tests.Components.Pages;

/// <summary>The front page: it names every room the program has, each heading leads to a page that exists, and it shows the caution.</summary>
public sealed class HomeTests : BunitContext
{
    private readonly string _dir = Path.Combine(Path.GetTempPath(), "exprmodel-bunit-home-" + Guid.NewGuid().ToString("N"));

    public HomeTests()
    {
        Directory.CreateDirectory(_dir);
        var options = Options.Create(new WebOptions());
        Services.AddSingleton(options);
        Services.AddSingleton(CatalogLocator.Ensure(Path.Combine(_dir, "catalog.db")));
        Services.AddSingleton(new DemoData(options));
    }

    protected override void Dispose(bool disposing)
    {
        base.Dispose(disposing);
        if (disposing && Directory.Exists(_dir)) Directory.Delete(_dir, recursive: true);
    }

    [Fact]
    public void Every_room_heading_links_to_a_routed_page_and_the_caution_is_shown()
    {
        var cut = Render<Home>();
        var routes = typeof(Home).Assembly.GetTypes()
            .SelectMany(t => t.GetCustomAttributes<RouteAttribute>())
            .Select(r => r.Template.TrimStart('/'))
            .ToHashSet();
        var links = cut.FindAll("[data-testid=rooms] h2 a").Select(a => a.GetAttribute("href")!).ToList();
        Assert.Equal(["load", "map", "workbench", "patch"], links);
        Assert.All(links, l => Assert.Contains(l, routes));
        Assert.Contains("Research use only", cut.Find("[data-testid=caution]").TextContent);
        Assert.Contains("channel entries", cut.Markup);
    }
}
