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
/// Slider-to-update latency in the browser, timed inside the page: a slider 'input' event is dispatched and the
/// time until the page marks the new trace, the new read-outs and the new f-I curve is taken with performance.now()
/// (MutationObserver on the panels' update counters). Targets from the issue: read-outs p95 150 ms, f-I 500 ms.
/// </summary>
[Collection("app")]
public sealed class BrowserLatencyBenchmark(AppFixture app, ITestOutputHelper output)
{
    private const int Moves = 25;

    private const string MeasureScript = """
        async ([selector, value]) => {
          const attr = (sel, name) => Number(document.querySelector(sel)?.getAttribute(name) ?? 0);
          const start = { trace: attr('[data-testid=spike-count]', 'data-trace-update'), read: attr('[data-testid=readouts]', 'data-update'), fi: attr('[data-testid=fi-status]', 'data-fi-update') };
          const times = {};
          const t0 = performance.now();
          const done = new Promise(resolve => {
            const check = () => {
              const now = performance.now() - t0;
              if (times.trace === undefined && attr('[data-testid=spike-count]', 'data-trace-update') > start.trace) times.trace = now;
              if (times.read === undefined && attr('[data-testid=readouts]', 'data-update') > start.read) times.read = now;
              if (times.fi === undefined && attr('[data-testid=fi-status]', 'data-fi-update') > start.fi) times.fi = now;
              if (times.trace !== undefined && times.read !== undefined && times.fi !== undefined) { observer.disconnect(); resolve(times); }
            };
            const observer = new MutationObserver(check);
            observer.observe(document.body, { attributes: true, subtree: true, attributeFilter: ['data-update', 'data-trace-update', 'data-fi-update'] });
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
        var results = new List<(string Model, double[] Trace, double[] Read, double[] Fi)>();

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

        output.WriteLine($"slider -> update latency in the browser, {Moves} moves per model (ms): p50 / p95 / max");
        foreach (var (model, trace, read, fi) in results)
            output.WriteLine($"{model,-22} trace {Stats(trace)} | read-outs {Stats(read)} | f-I {Stats(fi)}");
        var allRead = results.SelectMany(r => r.Read).ToArray();
        var allFi = results.SelectMany(r => r.Fi).ToArray();
        var allTrace = results.SelectMany(r => r.Trace).ToArray();
        output.WriteLine($"ALL                    trace {Stats(allTrace)} | read-outs {Stats(allRead)} (target p95 150) | f-I {Stats(allFi)} (target 500)");
        Console.WriteLine(string.Join("\n", results.Select(r => $"{r.Model}: read-outs p95 {Percentile(r.Read, 95):0} ms, f-I p95 {Percentile(r.Fi, 95):0} ms")));
        Assert.All(results, r => Assert.Equal(Moves, r.Read.Length)); // every move produced an update
        await context.CloseAsync();
    }

    private async Task<(string, double[], double[], double[])> Measure(IPage page, string model)
    {
        await WorkbenchTests.WaitForUpdateAfter(page, 0);
        await page.WaitForFunctionAsync("() => Number(document.querySelector('[data-testid=fi-status]')?.getAttribute('data-fi-update') ?? 0) > 0");
        var sliders = await page.Locator(".density-slider input[type=range]").AllAsync();
        var ids = new List<string>();
        foreach (var s in sliders) ids.Add(await s.GetAttributeAsync("id") ?? "");
        var trace = new List<double>();
        var read = new List<double>();
        var fi = new List<double>();
        var rng = new Random(7);
        for (int i = 0; i < Moves; i++)
        {
            // Moderate moves (50% to 200% of the as-expressed density) on a random channel.
            var id = ids[rng.Next(ids.Count)];
            int pos = rng.Next(650, 900);
            var r = await page.EvaluateAsync<JsonElement>(MeasureScript, new object[] { "#" + id, pos.ToString(CultureInfo.InvariantCulture) });
            if (r.TryGetProperty("trace", out var t)) trace.Add(t.GetDouble());
            if (r.TryGetProperty("read", out var x)) read.Add(x.GetDouble());
            if (r.TryGetProperty("fi", out var f)) fi.Add(f.GetDouble());
        }
        return (model, trace.ToArray(), read.ToArray(), fi.ToArray());
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
