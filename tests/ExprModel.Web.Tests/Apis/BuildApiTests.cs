using System.IO.Compression;
using System.Net.Http.Json;

namespace ExprModel.Web.Tests.Apis;

public sealed class BuildApiTests(AppFactory factory) : ApiTestBase(factory)
{
    private static string Demo(string file) => File.ReadAllText(DemoPath(file));

    private static string DemoPath(string file)
    {
        for (var d = new DirectoryInfo(AppContext.BaseDirectory); d is not null; d = d.Parent)
        {
            var f = Path.Combine(d.FullName, "catalog", "demo", file);
            if (File.Exists(f)) return f;
        }
        throw new FileNotFoundException(file);
    }

    private static ByteArrayContent FilePart(byte[] bytes) => new(bytes) { Headers = { ContentType = new("application/octet-stream") } };

    /// <summary>The demo survey as a multipart form: both files as file parts plus the given fields.</summary>
    private static MultipartFormDataContent DemoForm(params (string Name, string Value)[] fields)
    {
        var form = new MultipartFormDataContent
        {
            { FilePart(File.ReadAllBytes(DemoPath("counts.csv"))), "expression", "counts.csv" },
            { FilePart(File.ReadAllBytes(DemoPath("metadata.csv"))), "metadata", "metadata.csv" },
        };
        foreach (var (name, value) in fields) form.Add(new StringContent(value), name);
        return form;
    }

    private static byte[] Gzip(byte[] bytes)
    {
        using var buffer = new MemoryStream();
        using (var gz = new GZipStream(buffer, CompressionLevel.Fastest)) gz.Write(bytes);
        return buffer.ToArray();
    }

    [Fact]
    public async Task Builds_a_group_model_from_the_demo_survey_recording_its_derivation()
    {
        var r = await Client.PostAsJsonAsync("/api/build",
            new { expression = Demo("counts.csv"), metadata = Demo("metadata.csv"), groupBy = "group", group = "T1-fast" });
        Assert.Equal(200, (int)r.StatusCode);
        var body = await Json(r);
        var model = body.GetProperty("model");
        Assert.Equal("exprmodel-model", model.GetProperty("format").GetString());
        Assert.Contains("T1-fast", model.GetProperty("derivation").GetProperty("target").GetString());
        Assert.True(model.GetProperty("channels").GetArrayLength() >= 2);
        Assert.NotEmpty(body.GetProperty("densities").EnumerateArray());
        Assert.Contains("Research tool", model.GetProperty("caution").GetString());

        // The built model runs through the same read-out path.
        var readouts = await Json(await Client.PostAsJsonAsync("/api/readouts", new { model = System.Text.Json.Nodes.JsonNode.Parse(model.GetRawText()) }));
        Assert.NotEmpty(readouts.GetProperty("readouts").EnumerateArray());
    }

    [Fact]
    public async Task Excluding_a_gene_changes_the_model()
    {
        var plain = await Json(await Client.PostAsJsonAsync("/api/build",
            new { expression = Demo("counts.csv"), metadata = Demo("metadata.csv"), groupBy = "group", group = "T1-fast" }));
        var densities = plain.GetProperty("densities").EnumerateArray().ToList();
        var gene = densities.SelectMany(d => d.GetProperty("genes").EnumerateArray()).First().GetProperty("gene").GetString()!;
        var without = await Json(await Client.PostAsJsonAsync("/api/build", new
        {
            expression = Demo("counts.csv"),
            metadata = Demo("metadata.csv"),
            groupBy = "group",
            group = "T1-fast",
            overrides = new[] { new { gene, exclude = true } },
        }));
        Assert.NotEqual(plain.GetProperty("model").GetProperty("channels").GetRawText(), without.GetProperty("model").GetProperty("channels").GetRawText());
    }

    [Fact]
    public async Task A_bad_table_is_a_problem_naming_the_place()
    {
        var ragged = "gene,c1,c2,c3\nScn1a,1,2,3\nKcnc1,4,5\n";
        await AssertProblem(await Client.PostAsJsonAsync("/api/build", new { expression = ragged, cell = "c1" }), 400, "line 3");
        await AssertProblem(await Client.PostAsJsonAsync("/api/build", new { expression = "gene,c1\nScn1a,1\n", group = "x" }), 400, "metadata");
        await AssertProblem(await Client.PostAsJsonAsync("/api/build", new { cell = "c1" }), 400, "expression");
        await AssertProblem(await Client.PostAsJsonAsync("/api/build",
            new { expression = Demo("counts.csv"), metadata = Demo("metadata.csv"), groupBy = "group", group = "T9-none" }), 400, "T9-none");
    }

    [Fact]
    public async Task A_multipart_form_builds_the_same_model_as_the_json_body()
    {
        var json = await Json(await Client.PostAsJsonAsync("/api/build", new
        {
            expression = Demo("counts.csv"),
            expressionName = "counts.csv",
            metadata = Demo("metadata.csv"),
            metadataName = "metadata.csv",
            groupBy = "group",
            group = "T2-adapting",
            exponent = 0.8,
            clamp = false,
            capacitancePf = 80,
            temperatureC = 32,
            overrides = new[] { new { gene = "Kcnc1", exclude = true } },
        }));
        var r = await Client.PostAsync("/api/build", DemoForm(("groupBy", "group"), ("group", "T2-adapting"), ("exponent", "0.8"), ("clamp", "false"),
            ("capacitancePf", "80"), ("temperatureC", "32"), ("overrides", """[{"gene": "Kcnc1", "exclude": true}]""")));
        Assert.True(r.IsSuccessStatusCode, await r.Content.ReadAsStringAsync());
        var form = await Json(r);
        Assert.Equal(json.GetProperty("model").GetRawText(), form.GetProperty("model").GetRawText());
        Assert.Equal(json.GetProperty("densities").GetRawText(), form.GetProperty("densities").GetRawText());
        Assert.Contains("Research tool", form.GetProperty("caution").GetString());
        Assert.Contains("Research tool", form.GetProperty("model").GetProperty("caution").GetString());
    }

    [Fact]
    public async Task A_gzipped_table_upload_is_read()
    {
        var plain = await Json(await Client.PostAsync("/api/build", DemoForm(("groupBy", "group"), ("group", "T1-fast"))));
        var form = new MultipartFormDataContent
        {
            { FilePart(Gzip(File.ReadAllBytes(DemoPath("counts.csv")))), "expression", "counts.csv.gz" },
            { FilePart(Gzip(File.ReadAllBytes(DemoPath("metadata.csv")))), "metadata", "metadata.csv.gz" },
            { new StringContent("group"), "groupBy" },
            { new StringContent("T1-fast"), "group" },
        };
        var r = await Client.PostAsync("/api/build", form);
        Assert.True(r.IsSuccessStatusCode, await r.Content.ReadAsStringAsync());
        var gz = await Json(r);
        Assert.Equal(plain.GetProperty("model").GetProperty("channels").GetRawText(), gz.GetProperty("model").GetProperty("channels").GetRawText());
    }

    [Fact]
    public async Task Read_options_take_the_same_spellings_as_the_command_line()
    {
        // "rpkm" and upper case are the library's spellings (ReadOptionsParser), which the command line accepts too.
        var ok = await Client.PostAsJsonAsync("/api/build",
            new { expression = Demo("counts.csv"), metadata = Demo("metadata.csv"), groupBy = "group", group = "T1-fast", unit = "RPKM" });
        Assert.Equal(200, (int)ok.StatusCode);
        Assert.Equal("Fpkm", (await Json(ok)).GetProperty("model").GetProperty("derivation").GetProperty("unit").GetString());
        await AssertProblem(await Client.PostAsJsonAsync("/api/build", new { expression = Demo("counts.csv"), cell = "FH1001", unit = "umi" }), 400,
            "unit: 'umi' is not counts, cpm, tpm, fpkm or log-transformed.");
        await AssertProblem(await Client.PostAsJsonAsync("/api/build", new { expression = Demo("counts.csv"), cell = "FH1001", orientation = "rows" }), 400,
            "orientation: 'rows' is not genes-as-rows or cells-as-rows.");
    }

    [Fact]
    public async Task Form_problems_name_the_part_or_field()
    {
        var noTable = new MultipartFormDataContent { { new StringContent("c1"), "cell" } };
        await AssertProblem(await Client.PostAsync("/api/build", noTable), 400, "expression", "required");
        await AssertProblem(await Client.PostAsync("/api/build", DemoForm(("groupBy", "group"), ("group", "T1-fast"), ("exponent", "two"))), 400, "exponent",
            "'two'");
        await AssertProblem(await Client.PostAsync("/api/build", DemoForm(("groupBy", "group"), ("group", "T1-fast"), ("exponent", "9"))), 400, "exponent");
        await AssertProblem(await Client.PostAsync("/api/build", DemoForm(("groupBy", "group"), ("group", "T1-fast"), ("clamp", "maybe"))), 400, "clamp",
            "'maybe'");
        await AssertProblem(await Client.PostAsync("/api/build", DemoForm(("groupBy", "group"), ("group", "T1-fast"), ("overrides", "[{gene"))), 400,
            "overrides", "line 1");
        await AssertProblem(await Client.PostAsync("/api/build", DemoForm(("groupBy", "group"), ("group", "T1-fast"), ("exponnent", "1"))), 400, "exponnent",
            "not a field");
        await AssertProblem(await Client.PostAsync("/api/build", DemoForm(("groupBy", "cluster"), ("group", "T1-fast"))), 400, "metadata.csv", "cluster");
    }

    [Fact]
    public async Task A_malformed_table_part_is_a_problem_naming_the_file_and_line()
    {
        var form = new MultipartFormDataContent
        {
            { FilePart("gene,c1,c2,c3\nScn1a,1,2,3\nKcnc1,4,5\n"u8.ToArray()), "expression", "my-cells.csv" },
            { new StringContent("c1"), "cell" },
        };
        await AssertProblem(await Client.PostAsync("/api/build", form), 400, "my-cells.csv", "line 3");
    }

    [Fact]
    public async Task An_oversized_form_is_refused_with_413_whether_its_length_is_declared_or_not()
    {
        // The test host's limit is 1 MB (AppFactory).
        var big = new byte[1_200_000];
        Array.Fill(big, (byte)'1');
        var declared = new MultipartFormDataContent { { FilePart(big), "expression", "big.csv" }, { new StringContent("c1"), "cell" } };
        await AssertProblem(await Client.PostAsync("/api/build", declared), 413, "upload limit of 1 MB");

        // Streamed without a Content-Length: the parts are counted as they arrive.
        var streamed =
            new MultipartFormDataContent { { new StreamContent(new UnknownLengthStream(big)), "expression", "big.csv" }, { new StringContent("c1"), "cell" } };
        var request = new HttpRequestMessage(HttpMethod.Post, "/api/build") { Content = streamed };
        Assert.Null(streamed.Headers.ContentLength);
        await AssertProblem(await Client.SendAsync(request), 413, "upload limit of 1 MB");
    }

    [Fact]
    public async Task The_openapi_document_offers_both_content_types()
    {
        var doc = await Json(await Client.GetAsync("/openapi/v1.json"));
        var content = doc.GetProperty("paths").GetProperty("/api/build").GetProperty("post").GetProperty("requestBody").GetProperty("content");
        Assert.True(content.TryGetProperty("application/json", out _), content.GetRawText());
        Assert.True(content.TryGetProperty("multipart/form-data", out var form), content.GetRawText());
        Assert.Contains("expression", form.GetRawText());
    }

    /// <summary>A readable stream that will not say its length, so the client sends the body chunked.</summary>
    /// <summary>The demo triple (catalog/demo/mtx, the seeded counts as Matrix Market) as expression parts, plus the demo metadata.</summary>
    private static MultipartFormDataContent MatrixMarketForm(IEnumerable<(string FileName, byte[] Bytes)> expression,
        params (string Name, string Value)[] fields)
    {
        var form = new MultipartFormDataContent();
        foreach (var (name, bytes) in expression) form.Add(FilePart(bytes), "expression", name);
        form.Add(FilePart(File.ReadAllBytes(DemoPath("metadata.csv"))), "metadata", "metadata.csv");
        foreach (var (name, value) in fields) form.Add(new StringContent(value), name);
        return form;
    }

    private static (string, byte[])[] DemoTriple =>
        [.. new[] { "matrix.mtx", "genes.tsv", "barcodes.tsv" }.Select(f => (f, File.ReadAllBytes(DemoPath("mtx/" + f))))];

    private static readonly (string, string)[] T1Fast = [("groupBy", "group"), ("group", "T1-fast")];

    [Fact]
    public async Task A_matrix_market_upload_as_parts_in_a_zip_or_in_a_gnu_tar_gz_builds_the_model_the_csv_builds()
    {
        var fromCsv = await Json(await Client.PostAsync("/api/build", DemoForm(T1Fast)));
        var expected = fromCsv.GetProperty("densities").GetRawText();

        var parts = await Client.PostAsync("/api/build", MatrixMarketForm(DemoTriple.Reverse(), T1Fast));
        Assert.Equal(200, (int)parts.StatusCode);
        Assert.Equal(expected, (await Json(parts)).GetProperty("densities").GetRawText());

        var zip = Workspace.UploadArchiveTests.Zip([.. DemoTriple.Select(p => ("filtered/" + p.Item1, p.Item2))]);
        var fromZip = await Client.PostAsync("/api/build", MatrixMarketForm([("filtered.zip", zip)], T1Fast));
        Assert.Equal(200, (int)fromZip.StatusCode);
        Assert.Equal(expected, (await Json(fromZip)).GetProperty("densities").GetRawText());

        // Debian's GNU tar, gzip-compressed: an archive made outside the runtime that reads it.
        var dir = Directory.CreateDirectory(Path.Combine(Path.GetTempPath(), "exprmodel-tar-" + Guid.NewGuid().ToString("N"))).FullName;
        try
        {
            foreach (var (name, bytes) in DemoTriple) File.WriteAllBytes(Path.Combine(dir, name), bytes);
            var archive = Path.Combine(dir, "sample.tar.gz");
            using (var tar = System.Diagnostics.Process.Start("tar", ["-czf", archive, "-C", dir, "matrix.mtx", "genes.tsv", "barcodes.tsv"]))
                await tar.WaitForExitAsync();
            var fromTar = await Client.PostAsync("/api/build", MatrixMarketForm([("sample.tar.gz", File.ReadAllBytes(archive))], T1Fast));
            Assert.Equal(200, (int)fromTar.StatusCode);
            Assert.Equal(expected, (await Json(fromTar)).GetProperty("densities").GetRawText());
        }
        finally { Directory.Delete(dir, recursive: true); }
    }

    [Fact]
    public async Task Matrix_market_parts_that_do_not_fit_are_refused_naming_the_file()
    {
        var triple = DemoTriple;
        await AssertProblem(await Client.PostAsync("/api/build", MatrixMarketForm(triple[..2], T1Fast)), 400,
            "matrix.mtx came without its cells file", "barcodes.tsv");
        var genes = File.ReadAllLines(DemoPath("mtx/genes.tsv"));
        var shortGenes = System.Text.Encoding.UTF8.GetBytes(string.Join('\n', genes[..^1]) + "\n");
        await AssertProblem(await Client.PostAsync("/api/build", MatrixMarketForm([triple[0], ("genes.tsv", shortGenes), triple[2]], T1Fast)), 400,
            $"matrix.mtx has {genes.Length:N0} rows but genes.tsv lists {genes.Length - 1:N0} genes.");
        var evil = Workspace.UploadArchiveTests.Zip(("../../matrix.mtx", triple[0].Item2));
        await AssertProblem(await Client.PostAsync("/api/build", MatrixMarketForm([("evil.zip", evil)], T1Fast)), 400,
            "evil.zip: entry '../../matrix.mtx' points outside the archive");
    }

    private sealed class UnknownLengthStream(byte[] bytes) : MemoryStream(bytes)
    {
        public override bool CanSeek => false;
    }
}
