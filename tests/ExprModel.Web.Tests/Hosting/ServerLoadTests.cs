using System.Collections.Concurrent;
using System.Diagnostics;
using System.Net;
using System.Net.Http.Headers;
using System.Runtime;
using System.Text;
using System.Text.Json.Nodes;
using Xunit.Abstractions;

namespace ExprModel.Web.Tests.Hosting;

[CollectionDefinition(nameof(ServerLoadTests), DisableParallelization = true)]
public sealed class ServerLoadCollection;

/// <summary>
/// A bounded load on a real Kestrel server on a loopback port: 50 concurrent clients for 30 s, each cycling through builds,
/// simulations, read-outs and shares. Every answer must be a success or a documented refusal (503: a full build queue or the
/// simulation time limit; 429: the rate limit), and the server's managed memory must come back within 20 % of its start
/// after a full garbage collection. Runs alone (its own collection), so no other test's allocations are counted.
/// </summary>
/// <remarks>
/// The server runs in this process, so the client must not fill the heap the check measures: the request bodies are
/// encoded once as bytes and the answers are drained through one small buffer. Serialising the 284 KB table of each build
/// from a <see cref="JsonObject"/> rented a 3.4 MB char array per call (the writer's worst-case escaping room, 6 chars per
/// char) from the shared array pool, which caches one array per size class in every thread-pool thread: 66 MB of char and
/// 33 MB of byte arrays were still cached when the load ended, 99 of the 100 MB the previous measurement blamed on the
/// server. What the server itself caches the same way (the unescaped table of each build, about 512 KB per thread) goes
/// with the extra thread-pool threads the load started, which the runtime retires after about 20 s idle, and with the
/// pool's trim of arrays unused for 60 s. So the check compares heap sizes after full compacting collections, polled every
/// 2 s until the heap is back within 20 % or 90 s have passed; it never compares times. Measured 2026-12-03: run alone, 11 MB
/// before, 25 MB at the end of the load (21 pool threads), 14 MB 24 s later with the pool's 60 s trim still to come; run
/// after the Workbench area tests, 32 MB before, 40 MB at the end, 38 MB (1.19x) 9 s later.
/// </remarks>
[Collection(nameof(ServerLoadTests))]
public sealed class ServerLoadTests(ITestOutputHelper output)
{
    private const int Clients = 50;
    /// <summary>How long the memory check waits for the runtime's idle caches to let go: the 60 s pool trim and a margin.</summary>
    private static readonly TimeSpan Settle = TimeSpan.FromSeconds(90);
    private static readonly TimeSpan Duration = TimeSpan.FromSeconds(30);
    private static readonly string[] Operations = ["build", "simulate", "readouts", "share"];

    private async Task Load()
    {
        using var factory = new ConfiguredAppFactory(new Dictionary<string, string>
        {
            ["RateLimitPerMinute"] = "6000",
            ["RateLimitBurst"] = "300",
            ["SimulationTimeoutSeconds"] = "20",
        }, kestrel: true, environment: "Production");
        factory.StartServer();
        var requests = new Requests(Demo("counts.csv"), Demo("metadata.csv"), Preset("wb1996"));
        int threadsBefore = ThreadPool.ThreadCount;
        using var client = new HttpClient(new SocketsHttpHandler { PooledConnectionLifetime = TimeSpan.FromMinutes(5) })
        {
            BaseAddress = factory.Address,
            Timeout = TimeSpan.FromSeconds(90),
        };
        Assert.True(factory.Address.IsLoopback);

        // Warm up each route once (first compiles, the catalog's first reads), then take the baseline.
        foreach (var op in Operations)
        {
            using var r = await client.SendAsync(requests.For(op, 0, 0));
            Assert.True(r.IsSuccessStatusCode, $"warm-up {op}: {(int)r.StatusCode} {await r.Content.ReadAsStringAsync()}");
        }
        long before = ManagedHeapAfterFullCollection();

        var statuses = new ConcurrentDictionary<(string Op, int Status), int>();
        var errors = new ConcurrentBag<string>();
        var clock = Stopwatch.StartNew();
        await Task.WhenAll(Enumerable.Range(0, Clients).Select(c => Task.Run(async () =>
        {
            for (int k = 0; clock.Elapsed < Duration; k++)
            {
                string op = Operations[(c + k) % Operations.Length];
                try
                {
                    using var r = await client.SendAsync(requests.For(op, c, k), HttpCompletionOption.ResponseHeadersRead);
                    int status = (int)r.StatusCode;
                    statuses.AddOrUpdate((op, status), 1, (_, n) => n + 1);
                    if (status is 503 or 429)
                    {
                        if (r.Headers.RetryAfter is null && !(status == 503 && op != "build"))
                            errors.Add($"{op}: {status} without Retry-After");
                        await Task.Delay(200);
                    }
                    else if (!r.IsSuccessStatusCode) errors.Add($"{op}: {status} {await r.Content.ReadAsStringAsync()}");
                    else await Drain(r);
                }
                catch (Exception e) when (e is HttpRequestException or TaskCanceledException)
                {
                    errors.Add($"{op}: {e.GetType().Name} {e.Message}");
                }
            }
        })));
        clock.Stop();

        client.CancelPendingRequests();
        client.Dispose(); // the client's 50 connections and their buffers are not the server's
        long atEnd = ManagedHeapAfterFullCollection();
        int threadsAtEnd = ThreadPool.ThreadCount;
        // The pooled arrays go with the extra thread-pool threads that cache them (retired after about 20 s idle) and with
        // the shared pool's trim of arrays unused for 60 s (both the runtime's rules); each poll is a full compacting collection.
        var settle = Stopwatch.StartNew();
        long after = atEnd;
        while (after > before * 1.2 && settle.Elapsed < Settle)
        {
            await Task.Delay(2000);
            after = ManagedHeapAfterFullCollection();
        }
        foreach (var ((op, status), n) in statuses.OrderBy(s => s.Key)) output.WriteLine($"{op} {status}: {n}");
        output.WriteLine($"load {clock.Elapsed.TotalSeconds:0.0} s; managed heap {before >> 20} MB before, {atEnd >> 20} MB at the end "
            + $"({threadsAtEnd} pool threads, {threadsBefore} before), {after >> 20} MB after {settle.Elapsed.TotalSeconds:0} s idle "
            + $"({ThreadPool.ThreadCount} threads): {(double)after / before:0.00}x");
        Assert.True(errors.IsEmpty, string.Join("\n", errors.Take(20)));
        foreach (var op in Operations)
            Assert.True(statuses.Any(s => s.Key.Op == op && s.Key.Status is 200 or 201), $"no {op} succeeded under load");
        Assert.True(after <= before * 1.2, $"managed heap {before:N0} bytes before the load, {after:N0} after: more than 20 % growth");
    }

    /// <summary>One load serves both criteria of the issue (answers and memory), so the suite pays for 30 s of load once.</summary>
    [Fact]
    public Task Fifty_clients_for_thirty_seconds_get_only_answers_or_documented_refusals_and_leave_the_heap_within_20_percent() => Load();

    private static async Task Drain(HttpResponseMessage r)
    {
        await using var body = await r.Content.ReadAsStreamAsync();
        var buffer = new byte[16384];
        while (await body.ReadAsync(buffer) > 0) { }
    }

    private static long ManagedHeapAfterFullCollection()
    {
        for (int i = 0; i < 3; i++)
        {
            GCSettings.LargeObjectHeapCompactionMode = GCLargeObjectHeapCompactionMode.CompactOnce;
            GC.Collect(GC.MaxGeneration, GCCollectionMode.Forced, blocking: true, compacting: true);
            GC.WaitForPendingFinalizers();
        }
        return GC.GetTotalMemory(forceFullCollection: true);
    }

    /// <summary>The four request kinds, varied by client and iteration so not every answer is the same work.</summary>
    private sealed class Requests(string counts, string metadata, JsonNode model)
    {
        private static readonly string[] Groups = ["T1-fast", "T2-adapting"];

        public HttpRequestMessage For(string op, int client, int k) => op switch
        {
            "build" => Post("/api/build", _builds[(client + k) % Groups.Length]),
            "simulate" => Post("/api/simulate", new JsonObject
            {
                ["model"] = Scaled(k % 3),
                ["step"] = new JsonObject { ["amplitudeUaPerCm2"] = 0.5 * (k % 10), ["stepMs"] = 200 },
            }),
            "readouts" => Post("/api/readouts", new JsonObject { ["model"] = Scaled(k % 3) }),
            _ => Post("/api/models", new JsonObject { ["model"] = Scaled(k % 3), ["notes"] = $"load client {client}, round {k}" }),
        };

        /// <summary>The preset with its first channel's relative density at 1, 1.1 or 1.2.</summary>
        private JsonNode Scaled(int variant)
        {
            var copy = model.DeepClone();
            copy["channels"]![0]!["relativeDensity"] = 1 + 0.1 * variant;
            return copy;
        }

        /// <summary>
        /// The build bodies, one per group, written by hand once: the JSON writer would rent 6 chars of escaping room per char
        /// of the table from the shared pool, and those arrays would sit in the heap the check measures.
        /// </summary>
        private readonly byte[][] _builds = Groups.Select(g => Encoding.UTF8.GetBytes(string.Concat(
            "{\"expression\":", Quote(counts), ",\"metadata\":", Quote(metadata), ",\"groupBy\":\"group\",\"group\":", Quote(g), "}"))).ToArray();

        private static string Quote(string text)
        {
            var sb = new StringBuilder(text.Length + text.Length / 8 + 2).Append('"');
            foreach (var c in text)
            {
                if (c is '"' or '\\') sb.Append('\\').Append(c);
                else if (c < ' ') sb.Append("\\u").Append(((int)c).ToString("x4", System.Globalization.CultureInfo.InvariantCulture));
                else sb.Append(c);
            }
            return sb.Append('"').ToString();
        }

        private static HttpRequestMessage Post(string path, JsonObject body) => Post(path, Encoding.UTF8.GetBytes(body.ToJsonString()));

        private static HttpRequestMessage Post(string path, byte[] body)
        {
            var content = new ByteArrayContent(body);
            content.Headers.ContentType = new MediaTypeHeaderValue("application/json");
            return new(HttpMethod.Post, path) { Content = content };
        }
    }

    private static string Demo(string file) => File.ReadAllText(Find(Path.Combine("catalog", "demo", file)));

    private static JsonNode Preset(string id) => JsonNode.Parse(File.ReadAllText(Find(Path.Combine("catalog", "models", id + ".json"))))!;

    private static string Find(string relative)
    {
        for (var d = new DirectoryInfo(AppContext.BaseDirectory); d is not null; d = d.Parent)
            if (Path.Combine(d.FullName, relative) is var f && File.Exists(f)) return f;
        throw new FileNotFoundException(relative);
    }
}

