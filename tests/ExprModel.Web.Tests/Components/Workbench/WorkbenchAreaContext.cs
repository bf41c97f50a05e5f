using Bunit;
using ExprModel.Data.Catalog;
using ExprModel.Web.Hosting;
using ExprModel.Web.Simulation;
using ExprModel.Web.Workspace;
using Microsoft.AspNetCore.Components;
using Microsoft.Extensions.DependencyInjection;
using Microsoft.Extensions.Options;

// Not "...Components.Workbench": that namespace would hide the Workbench page type from the page tests beside this folder.
namespace ExprModel.Web.Tests.Components.WorkbenchParts;

/// <summary>
/// The set-up the Workbench area tests share: a bUnit context with the real catalog (built into a fresh temporary
/// database), the simulator behind its gate and a workspace, registered as the app registers them; sessions opened through
/// <see cref="NewSession"/> are disposed, and the folder removed, with the context.
/// </summary>
public abstract class WorkbenchAreaContext : BunitContext
{
    /// <summary>How long an area may take to run real simulations on the shared machine before an assertion gives up.</summary>
    protected static readonly TimeSpan Long = TimeSpan.FromMinutes(2);

    private readonly string _dir = Path.Combine(Path.GetTempPath(), "exprmodel-workbench-bunit-" + Guid.NewGuid().ToString("N"));
    private readonly List<WorkbenchSession> _sessions = [];

    protected ChannelCatalog Catalog { get; }
    protected ModelRunner Runner { get; }
    protected WorkspaceState Workspace { get; } = new();

    protected WorkbenchAreaContext()
    {
        JSInterop.Mode = JSRuntimeMode.Loose;
        Directory.CreateDirectory(_dir);
        Catalog = CatalogLocator.Ensure(Path.Combine(_dir, "catalog.db"));
        var gate = new SimulationGate(Options.Create(new WebOptions()));
        Runner = new ModelRunner(Catalog, gate);
        Services.AddSingleton(gate);
        Services.AddSingleton(Runner);
        Services.AddSingleton(Workspace);
        SetRendererInfo(new RendererInfo("Server", isInteractive: true)); // a live circuit, as in the browser
    }

    /// <summary>A Workbench session on this context's runner, workspace and catalog, disposed with the context.</summary>
    protected WorkbenchSession NewSession()
    {
        var session = new WorkbenchSession(Runner, Workspace, Catalog, () => Task.CompletedTask);
        _sessions.Add(session);
        return session;
    }

    protected override void Dispose(bool disposing)
    {
        foreach (var s in _sessions) s.Dispose();
        base.Dispose(disposing);
        try { Directory.Delete(_dir, true); } catch (IOException) { }
    }
}
