using System.Diagnostics;
using System.Net;
using System.Net.Sockets;
using System.Text;

namespace ExprModel.Web.Tests.Hosting;

/// <summary>
/// The real web app as a child process (the built ExprModel.Web.dll beside the sources, Production environment, loopback
/// only), for the fault tests that need a process to kill or a start-up to fail.
/// </summary>
public sealed class AppProcess : IDisposable
{
    private readonly Process _process;
    private readonly StringBuilder _output = new();

    public Uri Address { get; }
    public HttpClient Client { get; }

    private AppProcess(Process process, Uri address)
    {
        _process = process;
        Address = address;
        Client = new HttpClient { BaseAddress = address, Timeout = TimeSpan.FromSeconds(60) };
    }

    public string Output { get { lock (_output) return _output.ToString(); } }

    public bool HasExited => _process.HasExited;

    public int ExitCode => _process.ExitCode;

    /// <summary>Starts the app on a free loopback port with these databases; does not wait for it.</summary>
    public static AppProcess Start(string snapshotDb, string catalogDb)
    {
        int port;
        using (var probe = new TcpListener(IPAddress.Loopback, 0))
        {
            probe.Start();
            port = ((IPEndPoint)probe.LocalEndpoint).Port;
        }
        var info = new ProcessStartInfo("dotnet")
        {
            RedirectStandardOutput = true,
            RedirectStandardError = true,
            UseShellExecute = false,
        };
        info.ArgumentList.Add(WebDll());
        info.ArgumentList.Add("--urls");
        info.ArgumentList.Add($"http://127.0.0.1:{port}");
        info.Environment["ASPNETCORE_ENVIRONMENT"] = "Production";
        info.Environment["ExprModel__AppDatabasePath"] = snapshotDb;
        info.Environment["ExprModel__CatalogDatabasePath"] = catalogDb;
        var process = Process.Start(info)!;
        var app = new AppProcess(process, new Uri($"http://127.0.0.1:{port}"));
        process.OutputDataReceived += (_, e) => app.Append(e.Data);
        process.ErrorDataReceived += (_, e) => app.Append(e.Data);
        process.BeginOutputReadLine();
        process.BeginErrorReadLine();
        return app;
    }

    /// <summary>Waits until the app answers (a 404 for an unknown shared model) or has exited; true when it answers.</summary>
    public async Task<bool> ReadyAsync(TimeSpan limit)
    {
        var until = DateTime.UtcNow + limit;
        while (DateTime.UtcNow < until)
        {
            if (_process.HasExited) return false;
            try
            {
                var r = await Client.GetAsync("/api/models/AAAAAAAAAAAAAAAAAAAAAA");
                if (r.StatusCode == HttpStatusCode.NotFound) return true;
            }
            catch (HttpRequestException) { }
            await Task.Delay(200);
        }
        return false;
    }

    /// <summary>Waits for the process to end on its own (a refused start-up).</summary>
    public bool WaitForExit(TimeSpan limit)
    {
        if (!_process.WaitForExit(limit)) return false;
        _process.WaitForExit(); // drains the redirected output
        return true;
    }

    /// <summary>SIGKILL on Unix: no shutdown, no flush, no finally blocks.</summary>
    public void KillHard()
    {
        _process.Kill(entireProcessTree: true);
        _process.WaitForExit();
    }

    private void Append(string? line)
    {
        if (line is null) return;
        lock (_output) _output.AppendLine(line);
    }

    private static string WebDll()
    {
        // tests/ExprModel.Web.Tests/bin/<configuration>/<framework>/ -> src/ExprModel.Web/bin/<configuration>/<framework>/
        var here = new DirectoryInfo(AppContext.BaseDirectory.TrimEnd(Path.DirectorySeparatorChar));
        string framework = here.Name, configuration = here.Parent!.Name;
        var root = here.Parent!.Parent!.Parent!.Parent!.Parent!.FullName;
        var dll = Path.Combine(root, "src", "ExprModel.Web", "bin", configuration, framework, "ExprModel.Web.dll");
        return File.Exists(dll) ? dll : throw new FileNotFoundException($"build src/ExprModel.Web ({configuration}) first", dll);
    }

    public void Dispose()
    {
        Client.Dispose();
        if (!_process.HasExited) KillHard();
        _process.Dispose();
    }
}
