using System.IO.Compression;
using System.Net;
using System.Net.Http.Json;
using System.Text;
using System.Text.Json.Nodes;
using ExprModel.Web.Hosting;
using Microsoft.Extensions.DependencyInjection;

namespace ExprModel.Web.Tests.Apis;

/// <summary>
/// Hostile and broken requests through the HTTP API, each answered with its documented status and a problem naming where
/// (file, line and character, field, or the limit and its setting): bad encodings, gzip bombs (small ones: the limits are
/// lowered here), empty files, binary junk, huge fields and bodies, unknown fields and wrong types.
/// </summary>
public sealed class UploadCorpusTests(UploadCorpusTests.Factory factory) : ApiTestBase(factory), IClassFixture<UploadCorpusTests.Factory>
{
    /// <summary>Small limits so each bomb or oversized body is small: 1 MB uploads, 10,000 lines, 4 MB inflated, 64 KB model requests.</summary>
    public sealed class Factory() : ConfiguredAppFactory(new Dictionary<string, string>
    {
        ["MaxUploadMegabytes"] = "1",
        ["MaxTableLines"] = "10000",
        ["MaxDecompressedMegabytes"] = "4",
        ["MaxModelRequestKilobytes"] = "64",
        ["MaxSnapshotMegabytes"] = "1",
        ["MaxTextFieldChars"] = "1000",
        ["RateLimitPerMinute"] = "0",
        ["MaxConcurrentBuilds"] = "1",
        ["MaxQueuedBuilds"] = "0",
        ["PublicBaseUrl"] = "https://models.example.org/lab/",
    });

    private static byte[] Gzip(byte[] bytes)
    {
        using var buffer = new MemoryStream();
        using (var gz = new GZipStream(buffer, CompressionLevel.Optimal)) gz.Write(bytes);
        return buffer.ToArray();
    }

    /// <summary>A build form with the expression file (and a cell to build) and any extra fields.</summary>
    private static MultipartFormDataContent Form(string fileName, byte[] bytes, params (string Name, string Value)[] fields)
    {
        var form = new MultipartFormDataContent
        {
            { new ByteArrayContent(bytes) { Headers = { ContentType = new("application/octet-stream") } }, "expression", fileName },
            { new StringContent("c1"), "cell" },
        };
        foreach (var (name, value) in fields) form.Add(new StringContent(value), name);
        return form;
    }

    private static readonly byte[] Table = "gene,c1,c2\nScn1a,10,12\nKcnc1,3,4\n"u8.ToArray();

    /// <summary>Case name, request, status, fragments the problem's detail must hold.</summary>
    public static TheoryData<string> Cases => new(Corpus.Keys);

    private static readonly Dictionary<string, (Func<HttpRequestMessage> Request, int Status, string[] Fragments)> Corpus = new()
    {
        ["zip bomb of a matrix"] = (() => Post("/api/build", Form("bomb.zip", Workspace.UploadArchiveTests.Zip(("matrix.mtx", new byte[6_000_000])))),
            413, ["bomb.zip/matrix.mtx: the archive inflates past", "4 MB", "MaxDecompressedMegabytes"]),
        ["tar.gz bomb"] = (() => Post("/api/build", Form("bomb.tar.gz", Workspace.UploadArchiveTests.TarGz(("matrix.mtx", new byte[6_000_000])))),
            413, ["bomb.tar.gz", "MaxDecompressedMegabytes"]),
        ["tar.gz with a link"] = (() => Post("/api/build", Form("link.tar.gz", Workspace.UploadArchiveTests.TarGz(
            new System.Formats.Tar.PaxTarEntry(System.Formats.Tar.TarEntryType.SymbolicLink, "genes.tsv") { LinkName = "/etc/passwd" }))),
            400, ["link.tar.gz: entry 'genes.tsv' is a link"]),
        ["tar.gz entry climbing out"] = (() => Post("/api/build", Form("up.tar.gz", Workspace.UploadArchiveTests.TarGz(("/etc/cron.d/x", Table)))),
            400, ["up.tar.gz: entry '/etc/cron.d/x' points outside the archive"]),
        ["invalid UTF-8 on line 3"] = (() => Post("/api/build", Form("counts.csv", [.. "gene,c1,c2\nScn1a,1,2\nKcnc1,3,"u8, 0xFF, .. "4\n"u8])),
            400, ["counts.csv: line 3, character 9", "byte 0xFF (column 3) is not UTF-8"]),
        ["Latin-1 text"] = (() => Post("/api/build", Form("latin1.csv", Encoding.Latin1.GetBytes("gene,c1\nScn1a,1\nKcnc1,2\n# caf\u00e9\n"))),
            400, ["latin1.csv: line 4, character 6", "0xE9"]),
        ["gzip bomb of blank lines"] = (() => Post("/api/build", Form("bomb.csv.gz", Gzip([.. Table, .. new byte[3_000_000].Select(_ => (byte)'\n')]))),
            413, ["bomb.csv.gz: line 10,001", "more than 10,000 lines", "MaxTableLines"]),
        ["gzip bomb of one endless row"] = (() => Post("/api/build",
            Form("wide.csv.gz", Gzip([.. "gene,c1\nScn1a,"u8, .. new byte[6 << 20].Select(_ => (byte)'7')]))),
            413, ["wide.csv.gz", "past the limit of 4,194,304 bytes", "MaxDecompressedMegabytes"]),
        ["empty file"] = (() => Post("/api/build", Form("empty.csv", [])), 400, ["empty.csv: the file is empty"]),
        ["blank lines only"] = (() => Post("/api/build", Form("blank.csv", "\n\n\n"u8.ToArray())), 400, ["blank.csv: line 1"]),
        ["empty metadata"] = (() => Post("/api/build", new MultipartFormDataContent
            {
                { new ByteArrayContent(Table), "expression", "counts.csv" }, { new ByteArrayContent([]), "metadata", "groups.csv" },
                { new StringContent("group"), "groupBy" }, { new StringContent("A"), "group" },
            }), 400, ["groups.csv: the file is empty"]),
        ["empty table in JSON"] = (() => Post("/api/build", JsonContent.Create(new { expression = "", cell = "c1" })),
            400, ["expression.csv: the file is empty"]),
        ["binary junk"] = (() => Post("/api/build", Form("junk.csv", Junk(50_000))), 400, ["junk.csv", "line 1"]),
        ["upload over the limit"] = (() => Post("/api/build", Form("big.csv", new byte[1_200_000])), 413, ["upload limit of 1 MB", "MaxUploadMegabytes"]),
        ["unknown form field"] = (() => Post("/api/build", Form("counts.csv", Table, ("exponnet", "2"))), 400, ["exponnet: not a field"]),
        ["unknown JSON field in a build"] = (() => Post("/api/build", JsonContent.Create(new { expression = "gene,c1\nScn1a,1\n", cell = "c1", exponnet = 2 })),
            400, ["unknown field 'exponnet'"]),
        ["wrong type in a build"] = (() => Post("/api/build", JsonContent.Create(new { expression = "gene,c1\nScn1a,1\n", cell = "c1", exponent = "two" })),
            400, ["$.exponent"]),
        ["build temperature outside the simulated range"] = (() => Post("/api/build", Form("counts.csv", Table, ("temperatureC", "80"))),
            400, ["temperatureC must lie between -5 and 50 (got 80)"]),
        ["huge text field in a build"] = (() => Post("/api/build", JsonContent.Create(new { expression = "gene,c1\nScn1a,1\n", cell = new string('c', 5000) })),
            400, ["cell: 5,000 characters", "MaxTextFieldChars"]),
        ["unknown wrapper field in a simulation"] = (() => Post("/api/simulate", Model(m => { }, ("stepp", new JsonObject { ["amplitudeUaPerCm2"] = 5 }))),
            400, ["unknown field 'stepp'"]),
        ["unknown protocol field"] = (() => Post("/api/simulate", Model(m => { }, ("step", new JsonObject { ["amplitude"] = 5 }))),
            400, ["unknown field 'amplitude'", "$.step"]),
        ["wrong type in a protocol"] = (() => Post("/api/simulate", Model(m => { }, ("step", new JsonObject { ["amplitudeUaPerCm2"] = "five" }))),
            400, ["$.step.amplitudeUaPerCm2"]),
        ["simulation temperature outside the range"] = (() => Post("/api/simulate", Model(m => m["temperatureC"] = 80)),
            400, ["temperatureC must lie between -5 and 50 (got 80)"]),
        ["huge description in a model"] = (() => Post("/api/readouts", Model(m => m["description"] = new string('d', 5000))),
            400, ["model.description: 5,000 characters", "MaxTextFieldChars"]),
        ["model request over its body limit"] = (() => Post("/api/readouts", Model(m => m["notes"] = new JsonArray([.. Enumerable.Range(0, 200)
            .Select(_ => (JsonNode)new string('n', 900))]))), 413, ["64 KB", "MaxModelRequestKilobytes"]),
        ["chunked model request over its body limit"] = (() => Post("/api/simulate", new StreamContent(new EndlessJson())
        {
            Headers = { ContentType = new("application/json") },
        }), 413, ["64 KB", "MaxModelRequestKilobytes"]),
        ["huge notes in a share"] = (() => Post("/api/models", Model(m => { }, ("notes", new string('n', 5000)))), 400, ["notes: 5,000 characters"]),
        ["share over the snapshot limit"] = (() => Post("/api/models", Model(m => { }, ("expression", new string('1', 1_500_000)))),
            413, ["1 MB", "MaxSnapshotMegabytes"]),
        ["unknown share field"] = (() => Post("/api/models", Model(m => { }, ("parent", "abc"))), 400, ["unknown field 'parent'"]),
        ["what-if with an unknown field"] = (() => Post("/api/whatif/knockdown", Model(m => { }, ("levell", 0.5))), 400, ["unknown field 'levell'"]),
    };

    private static HttpRequestMessage Post(string path, HttpContent content) => new(HttpMethod.Post, path) { Content = content };

    /// <summary>A request carrying the wb1996 preset, changed by <paramref name="edit"/>, plus the given wrapper fields.</summary>
    private static JsonContent Model(Action<JsonObject> edit, params (string Name, JsonNode Value)[] fields)
    {
        var model = (JsonObject)Preset("wb1996");
        edit(model);
        var body = new JsonObject { ["model"] = model };
        foreach (var (name, value) in fields) body[name] = value;
        return JsonContent.Create(body);
    }

    private static byte[] Junk(int n)
    {
        var b = new byte[n];
        new Random(7).NextBytes(b);
        b[0] = 0xFF; // never UTF-8, so the junk is refused on line 1 whatever follows
        return b;
    }

    [Theory]
    [MemberData(nameof(Cases))]
    public async Task Each_bad_request_gets_its_status_and_a_message_naming_where(string name)
    {
        var (request, status, fragments) = Corpus[name];
        using var response = await Client.SendAsync(request());
        await AssertProblem(response, status, fragments);
    }

    [Fact]
    public async Task A_full_build_queue_answers_503_with_retry_after_at_once()
    {
        // On Kestrel (the in-memory test server starts the app only once the whole body has arrived): the first build takes
        // the only slot (one runs, none wait) and holds it while its body trickles in.
        using var server = new ConfiguredAppFactory(new Dictionary<string, string> { ["MaxConcurrentBuilds"] = "1", ["MaxQueuedBuilds"] = "0" },
            kestrel: true);
        server.StartServer();
        using var client = new HttpClient { BaseAddress = server.Address };
        var slow = new TrickleStream();
        var first = client.PostAsync("/api/build", new StreamContent(slow) { Headers = { ContentType = new("application/json") } });
        await slow.Started.Task.WaitAsync(TimeSpan.FromSeconds(30));
        var queue = server.Services.GetRequiredService<BuildQueue>();
        for (int i = 0; i < 300 && queue.Admitted == 0; i++) await Task.Delay(100);
        Assert.Equal(1, queue.Admitted);
        using var second = await client.PostAsJsonAsync("/api/build", new { expression = "gene,c1\nScn1a,1\n", cell = "c1" });
        Assert.Equal(HttpStatusCode.ServiceUnavailable, second.StatusCode);
        Assert.True(second.Headers.RetryAfter?.Delta >= TimeSpan.FromSeconds(1));
        await AssertProblem(second, 503, "MaxConcurrentBuilds");
        slow.Finish();
        using var done = await first;
        Assert.Equal(HttpStatusCode.OK, done.StatusCode);
    }

    [Fact]
    public async Task An_unknown_shared_model_page_is_404_with_the_not_found_note()
    {
        using var r = await Client.GetAsync("/m/0123456789abcdef0123456789abcdef");
        Assert.Equal(HttpStatusCode.NotFound, r.StatusCode);
        Assert.Contains("no shared model has this id", await r.Content.ReadAsStringAsync());
    }

    [Fact]
    public async Task The_share_link_starts_with_the_configured_public_address()
    {
        using var r = await Client.PostAsync("/api/models", Model(m => { }));
        Assert.Equal(HttpStatusCode.Created, r.StatusCode);
        var body = await Json(r);
        string id = body.GetProperty("id").GetString()!;
        Assert.Equal($"https://models.example.org/lab/m/{id}", body.GetProperty("link").GetString());
    }

    /// <summary>A JSON body without a length that never ends: "{"model": {"description": "xxxx...</summary>
    private sealed class EndlessJson : Stream
    {
        private long _sent;

        public override int Read(byte[] buffer, int offset, int count)
        {
            if (_sent == 0)
            {
                var head = "{\"model\": {\"description\": \""u8;
                head.CopyTo(buffer.AsSpan(offset));
                _sent = head.Length;
                return head.Length;
            }
            // Ends after 4 MB (unterminated), so a server that read it all would still finish, with a 400 instead of the 413.
            int n = (int)Math.Min(count, (4 << 20) - _sent);
            buffer.AsSpan(offset, n).Fill((byte)'x');
            _sent += n;
            return n;
        }

        public override bool CanRead => true;
        public override bool CanSeek => false;
        public override bool CanWrite => false;
        public override long Length => throw new NotSupportedException();
        public override long Position { get => 0; set => throw new NotSupportedException(); }
        public override void Flush() { }
        public override long Seek(long offset, SeekOrigin origin) => throw new NotSupportedException();
        public override void SetLength(long value) => throw new NotSupportedException();
        public override void Write(byte[] buffer, int offset, int count) => throw new NotSupportedException();
    }

    /// <summary>A build body that sends its first bytes, then waits for <see cref="Finish"/> before sending the rest.</summary>
    private sealed class TrickleStream : Stream
    {
        // Padded past the client's write buffer (JSON allows the blanks), so the request's head reaches the server before the rest.
        private readonly byte[] _head = [.. "{\"cell\": \"c1\","u8, .. Enumerable.Repeat((byte)' ', 100_000)];
        private readonly byte[] _tail = "\"expression\": \"gene,c1\\nScn1a,1\\nKcnc1,2\\n\"}"u8.ToArray();
        private readonly TaskCompletionSource _go = new(TaskCreationOptions.RunContinuationsAsynchronously);
        private int _step;

        public TaskCompletionSource Started { get; } = new(TaskCreationOptions.RunContinuationsAsynchronously);

        public void Finish() => _go.TrySetResult();

        public override int Read(byte[] buffer, int offset, int count) => ReadAsync(buffer, offset, count).GetAwaiter().GetResult();

        public override async Task<int> ReadAsync(byte[] buffer, int offset, int count, CancellationToken cancel)
        {
            switch (_step++)
            {
                case 0:
                    _head.CopyTo(buffer, offset);
                    Started.TrySetResult();
                    return _head.Length;
                case 1:
                    await _go.Task.WaitAsync(cancel);
                    _tail.CopyTo(buffer, offset);
                    return _tail.Length;
                default:
                    return 0;
            }
        }

        public override bool CanRead => true;
        public override bool CanSeek => false;
        public override bool CanWrite => false;
        public override long Length => throw new NotSupportedException();
        public override long Position { get => 0; set => throw new NotSupportedException(); }
        public override void Flush() { }
        public override long Seek(long offset, SeekOrigin origin) => throw new NotSupportedException();
        public override void SetLength(long value) => throw new NotSupportedException();
        public override void Write(byte[] buffer, int offset, int count) => throw new NotSupportedException();
    }
}
