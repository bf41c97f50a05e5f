using ExprModel.Core.Expression;
using ExprModel.Core.Expression.Delimited;

namespace ExprModel.Core.Tests.Expression.Delimited;

public sealed class DelimitedTableReaderTests : IDisposable
{
    private readonly TempFiles _files = new();
    public void Dispose() => _files.Dispose();

    // A 4-gene x 3-cell count table. Column sums worked by hand: c1 = 5+0+2+10 = 17, c2 = 1+3+0+4 = 8, c3 = 0+0+7+1 = 8.
    private const string GenesByCells = "gene,c1,c2,c3\nScn1a,5,1,0\nKcnc1,0,3,0\nGapdh,2,0,7\nActb,10,4,1\n";
    private static readonly double[] ColumnSums = [17, 8, 8];

    private static ExpressionReadOptions KeepChannels => new() { KeepGene = g => g.StartsWith("Scn") || g.StartsWith("Kcn") };

    [Fact]
    public void GenesAsRows_KeepsFilteredGenes_LibrarySizesCoverAllGenes()
    {
        var t = DelimitedTableReader.Read(_files.Text("a.csv", GenesByCells), KeepChannels);
        Assert.Equal(["c1", "c2", "c3"], t.CellIds);
        Assert.Equal(["Kcnc1", "Scn1a"], t.Genes.Keys.Order());
        Assert.Equal([5.0, 1, 0], t.Genes["Scn1a"]);
        Assert.Equal(ColumnSums, t.LibrarySizes);
        Assert.Equal(4, t.TotalGeneCount);
        Assert.Equal(TableOrientation.GenesAsRows, t.Orientation);
        Assert.Equal(ExpressionUnit.Counts, t.Unit);
        Assert.Contains("whole number", t.UnitNote);
        Assert.Contains("comma", t.FormatNote);
    }

    [Fact]
    public void CountsNormaliseToCpmByLibrarySize()
    {
        // CPM = count / library size * 1e6 (common practice; DOMAIN.md "Expression to conductance").
        var t = DelimitedTableReader.Read(_files.Text("a.csv", GenesByCells), KeepChannels);
        var cpm = t.Normalised("Scn1a");
        Assert.Equal(5.0 / 17 * 1e6, cpm[0], 6);
        Assert.Equal(1.0 / 8 * 1e6, cpm[1], 6);
        Assert.Equal(0, cpm[2]);
    }

    [Fact]
    public void CellsAsRows_GivesTheSameTableAsGenesAsRows()
    {
        const string transposed = "cell,Scn1a,Kcnc1,Gapdh,Actb\nc1,5,0,2,10\nc2,1,3,0,4\nc3,0,0,7,1\n";
        var t = DelimitedTableReader.Read(_files.Text("t.csv", transposed), KeepChannels);
        Assert.Equal(TableOrientation.CellsAsRows, t.Orientation);
        Assert.Equal(["c1", "c2", "c3"], t.CellIds);
        Assert.Equal([5.0, 1, 0], t.Genes["Scn1a"]);
        Assert.Equal([0.0, 3, 0], t.Genes["Kcnc1"]);
        Assert.Equal(ColumnSums, t.LibrarySizes);
    }

    [Theory]
    [InlineData("\t", "tab")]
    [InlineData(";", "semicolon")]
    [InlineData(",", "comma")]
    public void DetectsDelimiter(string delimiter, string name)
    {
        var t = DelimitedTableReader.Read(_files.Text("d.txt", GenesByCells.Replace(",", delimiter)), KeepChannels);
        Assert.Contains(name, t.FormatNote);
        Assert.Equal(ColumnSums, t.LibrarySizes);
    }

    [Fact]
    public void SemicolonTableWithDecimalCommas_IsReadWithANote()
    {
        // Spreadsheets in decimal-comma locales export ';'-delimited text with ',' as the decimal separator (common practice).
        const string table = "gene;c1;c2\nScn1a;38,5;1\nKcnc1;0;2,25\nGapdh;1,5;0\n";
        var t = DelimitedTableReader.Read(_files.Text("locale.csv", table), KeepChannels);
        Assert.Equal([38.5, 1], t.Genes["Scn1a"]);
        Assert.Equal([0, 2.25], t.Genes["Kcnc1"]);
        Assert.Equal([40.0, 3.25], t.LibrarySizes);
        var note = Assert.Single(t.Notes, n => n.Contains("decimal comma"));
        Assert.Contains("3 value(s)", note);
        Assert.Contains("line 2, column 2", note);
    }

    [Fact]
    public void CommaTable_NeverReadsACommaAsDecimal()
    {
        var e = Assert.Throws<ExpressionFormatException>(() => DelimitedTableReader.Read(_files.Text("q.csv", "gene,c1\nScn1a,\"38,5\"\n"), KeepChannels));
        Assert.Contains("'38,5' is not a number", e.Message);
    }

    [Fact]
    public void ReadsGzipAndByteOrderMark()
    {
        var t = DelimitedTableReader.Read(_files.Text("a.csv.gz", GenesByCells, bom: true, gzip: true), KeepChannels);
        Assert.Contains("gzip", t.FormatNote);
        Assert.Equal("c1", t.CellIds[0]); // the BOM must not end up in the first identifier
        Assert.Equal(ColumnSums, t.LibrarySizes);
    }

    [Fact]
    public void QuotedFields_FollowRfc4180()
    {
        // RFC 4180 section 2, rules 5-7: fields may be quoted; quoted fields may hold delimiters, line breaks and
        // doubled quotes standing for one quote.
        const string csv = "\"gene\",\"cell, one\",\"cell \"\"two\"\"\",\"cell\nthree\"\r\n\"Scn1a\",\"5\",1,0\r\nGapdh,2,0,7\r\n";
        var t = DelimitedTableReader.Read(_files.Text("q.csv", csv), KeepChannels);
        Assert.Equal(["cell, one", "cell \"two\"", "cell\nthree"], t.CellIds);
        Assert.Equal([5.0, 1, 0], t.Genes["Scn1a"]);
    }

    [Fact]
    public void HeaderWithoutCornerCell_IsRecognisedAndNoted()
    {
        var t = DelimitedTableReader.Read(_files.Text("n.csv", "c1,c2,c3\nScn1a,5,1,0\nGapdh,2,0,7\n"), KeepChannels);
        Assert.Equal(["c1", "c2", "c3"], t.CellIds);
        Assert.Contains(t.Notes, n => n.Contains("no top-left cell"));
    }

    [Fact]
    public void Orientation_DetectedFromCornerLabelOrIdentifierShape_AndOverridable()
    {
        // No filter: the corner label decides.
        var byLabel = DelimitedTableReader.Read(_files.Text("l.csv", GenesByCells));
        Assert.Equal(TableOrientation.GenesAsRows, byLabel.Orientation);
        Assert.Contains("top-left", byLabel.OrientationNote);

        // No label, no filter: barcodes on one axis and varied symbols on the other decide.
        const string shaped = ",AAACCTGAGAAGGCCT-1,AAACCTGAGCATCATC-1,AAACCTGCAGGTGCCT-1\nScn1a,1,0,2\nGapdh,4,5,6\nKcnc1,0,0,1\nActb,9,9,9\n";
        var byShape = DelimitedTableReader.Read(_files.Text("s.csv", shaped));
        Assert.Equal(TableOrientation.GenesAsRows, byShape.Orientation);
        Assert.Contains("look like gene identifiers", byShape.OrientationNote);

        // The user's statement wins over detection (here reading the genes x cells table the other way round).
        var forced = DelimitedTableReader.Read(_files.Text("f.csv", GenesByCells), new() { Orientation = TableOrientation.CellsAsRows });
        Assert.Equal(TableOrientation.CellsAsRows, forced.Orientation);
        Assert.Equal(["Scn1a", "Kcnc1", "Gapdh", "Actb"], forced.CellIds);
        Assert.Contains("given by the user", forced.OrientationNote);
    }

    [Fact]
    public void LogLookingValues_AreRefusedWithoutAStatedTransform()
    {
        const string log = "gene,c1,c2\nScn1a,2.5,0\nGapdh,7.1,6.3\n";
        var e = Assert.Throws<ExpressionFormatException>(() => DelimitedTableReader.Read(_files.Text("log.csv", log)));
        Assert.Contains("log-transformed", e.Message);
        Assert.Contains("log.csv", e.Message);
    }

    [Fact]
    public void StatedLog2Transform_IsUndone()
    {
        // log2(1 + x) = 3 means x = 2^3 - 1 = 7; log2(1 + 0) = 0 (arithmetic identity).
        const string log = "gene,c1,c2\nScn1a,3,0\nGapdh,1,2\n";
        var t = DelimitedTableReader.Read(_files.Text("log2.csv", log), new() { LogTransform = LogTransform.Log2Plus1 });
        Assert.Equal(7, t.Genes["Scn1a"][0], 9);
        Assert.Equal(0, t.Genes["Scn1a"][1], 9);
        Assert.Equal(7 + 1, t.LibrarySizes[0], 9);
        Assert.Contains("undid log2(1 + x)", t.UnitNote);
    }

    [Fact]
    public void CellsSummingToOneMillion_AreDetectedAsCpmOrTpm()
    {
        const string cpm = "gene,c1,c2\nScn1a,250000.5,100\nGapdh,749999.5,999900\n";
        var t = DelimitedTableReader.Read(_files.Text("cpm.csv", cpm));
        Assert.Equal(ExpressionUnit.Cpm, t.Unit);
        Assert.Contains("one million", t.UnitNote);
        Assert.Equal(t.Genes["Scn1a"], t.Normalised("Scn1a")); // CPM is used as given
    }

    [Fact]
    public void StatedUnit_IsUsedAndChecked()
    {
        var t = DelimitedTableReader.Read(_files.Text("a.csv", GenesByCells), new() { Unit = ExpressionUnit.Tpm });
        Assert.Equal(ExpressionUnit.Tpm, t.Unit);
        Assert.Contains("given by the user", t.UnitNote);
        Assert.Contains(t.Notes, n => n.Contains("do not sum to one million"));
    }

    [Fact]
    public void DuplicateGene_NotKept_IsNotedAndCountedTwice()
    {
        const string dup = "gene,c1\nScn1a,1\nMalat1,5\nMalat1,7\n";
        var t = DelimitedTableReader.Read(_files.Text("dup.csv", dup), new() { KeepGene = g => g == "Scn1a" });
        Assert.Equal(1 + 5 + 7, t.LibrarySizes[0]);
        Assert.Contains(t.Notes, n => n.Contains("'Malat1'") && n.Contains("line 3") && n.Contains("line 4"));
    }

    [Fact]
    public void DuplicateGene_Kept_IsAnErrorUnlessFirstIsChosen()
    {
        const string dup = "gene,c1\nScn1a,1\nScn1a,4\n";
        var path = _files.Text("dupk.csv", dup);
        var e = Assert.Throws<ExpressionFormatException>(() => DelimitedTableReader.Read(path));
        Assert.Contains("line 3", e.Message);
        var t = DelimitedTableReader.Read(path, new() { DuplicateGenes = DuplicateGenePolicy.KeepFirst });
        Assert.Equal([1.0], t.Genes["Scn1a"]);
        Assert.Equal(5, t.LibrarySizes[0]);
        Assert.Contains(t.Notes, n => n.Contains("kept the first"));
    }

    [Fact]
    public void CaseCollisionsAndVersionedEnsemblIds_AreNoted()
    {
        const string table = "gene,c1\nScn1a,1\nSCN1A,2\nENSMUSG00000064329.3,4\nGapdh,5\n";
        var t = DelimitedTableReader.Read(_files.Text("amb.csv", table));
        Assert.Contains(t.Notes, n => n.Contains("'SCN1A'") && n.Contains("'Scn1a'") && n.Contains("differ only in case"));
        Assert.Contains(t.Notes, n => n.Contains("version suffix") && n.Contains("ENSMUSG00000064329.3"));
    }

    [Fact]
    public void DecompressedSizeLimit_StopsInflationWithLocatedError()
    {
        // A valid table bigger than the stated budget: the limit, not the content, must stop the read.
        var big = "gene,c1,c2\n" + string.Concat(Enumerable.Range(0, 5000).Select(i => $"G{i},1,2\n"));
        var path = _files.Text("big.csv.gz", big, gzip: true);
        var e = Assert.Throws<ExpressionLimitException>(() => DelimitedTableReader.Read(path, new() { MaxDecompressedBytes = 10_000 }));
        Assert.Contains("big.csv.gz", e.Message);
        Assert.Contains("decompressed data", e.Message);
        Assert.Contains("limit of 10,000 bytes", e.Message);
    }

    [Fact]
    public void CellsSummingToAnotherCommonTotal_AreReadAsGivenWithThatTotalInTheNote()
    {
        // Each cell sums to 10,000 (2500.5 + 7499.5, 100 + 9900): normalised, but not per million.
        const string scaled = "gene,c1,c2\nScn1a,2500.5,100\nGapdh,7499.5,9900\n";
        var t = DelimitedTableReader.Read(_files.Text("p10k.csv", scaled));
        Assert.Equal(ExpressionUnit.Fpkm, t.Unit);
        Assert.Contains("sums to 10000", t.UnitNote);
    }
}
