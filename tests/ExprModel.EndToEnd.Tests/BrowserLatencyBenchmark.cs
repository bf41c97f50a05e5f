using System.Globalization;
using System.Text.Json;
using Microsoft.Playwright;
using Xunit.Abstractions;

namespace ExprModel.EndToEnd.Tests;

/// <summary>Runs only when EXPRMODEL_BROWSER_BENCH=1: it measures, prints, and asserts nothing about time.</summary>
public sealed class BenchmarkFactAttribute : FactAttribute
{
    public BenchmarkFactAttribute()
    {
        if (Environment.GetEnvironmentVariable("EXPRMODEL_BROWSER_BENCH") != "1") Skip = "browser benchmark: set EXPRMODEL_BROWSER_BENCH=1 to run it";
    }
}

/// <summary>
/// Slider-to-update latency in the browser, timed inside the page with performance.now(): a slider 'input' event is
/// dispatched, then a MutationObserver notes when the voltage plot has been redrawn with the new trace (the plot queue
/// marks its figure after the plot library finishes), when the read-out table shows the first stage (rest, passive,
/// rheobase, spike shape), when every read-out is in, and when the f-I plot has been redrawn.
/// Targets from the issue: trace and read-outs p95 150 ms, f-I 500 ms.
/// </summary>
[Collection("app")]
public sealed class BrowserLatencyBenchmark(AppFixture app, ITestOutputHelper output)
{
    private const int Moves = 25;

    private const string MeasureScript = """
        async ([selector, value]) => {
          const attr = (sel, name) => Number(document.querySelector(sel)?.getAttribute(name) ?? 0);
          const marks = {
            trace: () => attr('[data-testid=plot-voltage]', 'data-shown'),
            read: () => attr('[data-testid=readouts]', 'data-update'),
            all: () => attr('[data-testid=readouts]', 'data-complete-update'),
            fi: () => attr('[data-testid=plot-fi]', 'data-shown'),
          };
          const start = {};
          for (const k in marks) start[k] = marks[k]();
          const times = {};
          const t0 = performance.now();
          const done = new Promise(resolve => {
            const check = () => {
              const now = performance.now() - t0;
              for (const k in marks) if (times[k] === undefined && marks[k]() > start[k]) times[k] = now;
              if (Object.keys(marks).every(k => times[k] !== undefined)) {
                observer.disconnect();
                // The server's own share: from the slider event reaching it to the trace / first read-outs being ready.
                const p = document.querySelector('[data-testid=spike-count]');
                times.serverTrace = Number(p?.getAttribute('data-server-trace-ms') ?? NaN);
                times.serverFirst = Number(p?.getAttribute('data-server-first-ms') ?? NaN);
                resolve(times);
              }
            };
            const observer = new MutationObserver(check);
            observer.observe(document.body, { attributes: true, subtree: true, attributeFilter: ['data-update', 'data-complete-update', 'data-shown'] });
            setTimeout(() => { observer.disconnect(); resolve(times); }, 20000);
          });
          const input = document.querySelector(selector);
          input.value = value;
          input.dispatchEvent(new Event('input', { bubbles: true }));
          return await done;
        }
        """;

    [BenchmarkFact]
    public async Task Slider_to_readouts_and_fi_latency()
    {
        var (context, page, _) = await app.NewPageAsync();
        page.SetDefaultTimeout(120_000);
        var results = new List<Latencies>();

        foreach (var preset in new[] { "wb1996", "cortex-rs2008" })
        {
            await app.GotoAsync(page, $"/workbench?preset={preset}");
            results.Add(await Measure(page, "preset " + preset));
        }

        await app.GotoAsync(page, "/load");
        await page.Locator("[data-testid=use-demo]").ClickAsync();
        await page.Locator("[data-testid=to-map]").ClickAsync();
        await page.Locator("[data-testid=build]").ClickAsync();
        foreach (var group in new[] { "T1-fast", "T2-adapting" })
        {
            await page.Locator($"[data-testid=open-{group}]").ClickAsync();
            results.Add(await Measure(page, "demo " + group));
            await page.Locator("[data-testid=nav-map]").ClickAsync();
            await page.WaitForSelectorAsync($"[data-testid=open-{group}]");
        }

        var lines = new List<string> { $"slider -> update latency in the browser, {Moves} moves per model (ms): p50 / p95 / max" };
        foreach (var r in results)
            lines.Add($"{r.Model,-22} trace drawn {Stats(r.Trace)} | read-outs first stage {Stats(r.Read)} | all read-outs {Stats(r.All)} | " +
                $"f-I drawn {Stats(r.Fi)}");
        lines.Add($"{"ALL",-22} trace drawn {Stats(results.SelectMany(r => r.Trace).ToArray())} | read-outs first stage " +
            $"{Stats(results.SelectMany(r => r.Read).ToArray())} | " +
            $"all read-outs {Stats(results.SelectMany(r => r.All).ToArray())} | f-I drawn {Stats(results.SelectMany(r => r.Fi).ToArray())}");
        var demo = results.Where(r => r.Model.StartsWith("demo ", StringComparison.Ordinal)).ToArray();
        lines.Add($"{"DEMO MODELS",-22} trace drawn {Stats(demo.SelectMany(r => r.Trace).ToArray())} | read-outs first stage " +
            $"{Stats(demo.SelectMany(r => r.Read).ToArray())} | " +
            $"all read-outs {Stats(demo.SelectMany(r => r.All).ToArray())} | f-I drawn {Stats(demo.SelectMany(r => r.Fi).ToArray())}");
        lines.Add("targets (for the demo models): trace and read-outs p95 150 ms; f-I p95 500 ms");
        lines.Add("server's share (event received -> ready on the server; the rest is transfer, rendering and drawing in the browser):");
        foreach (var r in results)
            lines.Add($"{r.Model,-22} trace ready {Stats(r.ServerTrace)} | first read-outs ready {Stats(r.ServerFirst)}");
        lines.Add("per move, in order (trace drawn / first read-outs shown, ms):");
        foreach (var r in results)
            lines.Add($"{r.Model,-22} " + string.Join(" ", r.Trace.Zip(r.Read, (t, x) => $"{t:0}/{x:0}")));
        lines.Add($"{"ALL",-22} trace ready {Stats(results.SelectMany(r => r.ServerTrace).ToArray())} | first read-outs ready " +
            $"{Stats(results.SelectMany(r => r.ServerFirst).ToArray())}");
        foreach (var l in lines) { output.WriteLine(l); Console.WriteLine(l); }
        Assert.All(results, r => Assert.Equal(Moves, r.Read.Length)); // every move produced an update
        await context.CloseAsync();
    }

    /// <summary>One model's latencies per move (ms): in the browser, then the server's share of the first two.</summary>
    private sealed record Latencies(string Model, double[] Trace, double[] Read, double[] All, double[] Fi, double[] ServerTrace, double[] ServerFirst);

    private async Task<Latencies> Measure(IPage page, string model)
    {
        await WorkbenchTests.WaitForUpdateAfter(page, 0);
        await page.WaitForFunctionAsync("() => Number(document.querySelector('[data-testid=plot-fi]')?.getAttribute('data-shown') ?? 0) > 0");
        var sliders = await page.Locator(".density-slider input[type=range]").AllAsync();
        var ids = new List<string>();
        foreach (var s in sliders) ids.Add(await s.GetAttributeAsync("id") ?? "");
        var trace = new List<double>();
        var read = new List<double>();
        var all = new List<double>();
        var fi = new List<double>();
        var serverTrace = new List<double>();
        var serverFirst = new List<double>();
        var rng = new Random(7);
        for (int i = 0; i < Moves; i++)
        {
            // Moderate moves (50% to 200% of the as-expressed density) on a random channel.
            var id = ids[rng.Next(ids.Count)];
            int pos = rng.Next(650, 900);
            var r = await page.EvaluateAsync<JsonElement>(MeasureScript, new object[] { "#" + id, pos.ToString(CultureInfo.InvariantCulture) });
            if (r.TryGetProperty("trace", out var t)) trace.Add(t.GetDouble());
            if (r.TryGetProperty("read", out var x)) read.Add(x.GetDouble());
            if (r.TryGetProperty("all", out var a)) all.Add(a.GetDouble());
            if (r.TryGetProperty("fi", out var f)) fi.Add(f.GetDouble());
            if (r.TryGetProperty("serverTrace", out var st) && st.ValueKind == JsonValueKind.Number) serverTrace.Add(st.GetDouble());
            if (r.TryGetProperty("serverFirst", out var sf) && sf.ValueKind == JsonValueKind.Number) serverFirst.Add(sf.GetDouble());
        }
        return new Latencies(model, trace.ToArray(), read.ToArray(), all.ToArray(), fi.ToArray(), serverTrace.ToArray(), serverFirst.ToArray());
    }

    private static double Percentile(double[] v, double p)
    {
        if (v.Length == 0) return double.NaN;
        var s = v.Order().ToArray();
        double rank = p / 100 * (s.Length - 1);
        int lo = (int)Math.Floor(rank), hi = (int)Math.Ceiling(rank);
        return s[lo] + (s[hi] - s[lo]) * (rank - lo);
    }

    private static string Stats(double[] v) => $"{Percentile(v, 50),6:0} / {Percentile(v, 95),6:0} / {(v.Length == 0 ? double.NaN : v.Max()),6:0}";
}
