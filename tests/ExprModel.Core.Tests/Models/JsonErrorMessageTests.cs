using System.Text.Json;
using ExprModel.Core.Models;

namespace ExprModel.Core.Tests.Models;

public class JsonErrorMessageTests
{
    private static JsonException Failure(string json)
    {
        try { JsonSerializer.Deserialize<Dictionary<string, int>>(json); }
        catch (JsonException e) { return e; }
        throw new InvalidOperationException("the JSON was read");
    }

    [Fact]
    public void NamesSourceLineAndPositionFromOneAndThePath()
    {
        // The string "x" where a number belongs sits on line 2 under key b.
        var e = Failure("{\"a\": 1,\n  \"b\": \"x\"}");
        var text = JsonErrorMessage.For(e, "model.json");
        Assert.StartsWith("model.json: line 2, position ", text);
        Assert.Contains(", at $.b: ", text);
        Assert.DoesNotContain("LineNumber", text);
    }

    [Fact]
    public void TheCallersReasonReplacesTheParsers()
    {
        var e = Failure("[1,");
        Assert.Equal($"overrides: {JsonErrorMessage.Location(e)}: not a list.", JsonErrorMessage.For(e, "overrides", "not a list."));
        Assert.StartsWith("line 1, position ", JsonErrorMessage.For(e));
    }

    [Fact]
    public void ModelFilesUseIt()
    {
        var ex = Assert.Throws<ModelFileException>(() => ModelDocument.Parse("{ \"format\": \"exprmodel-model\",\n \"schemaVersion\": \"one\" }", "m.json"));
        Assert.StartsWith("m.json: line 2, position ", ex.Message);
        Assert.Contains("at $.schemaVersion: ", ex.Message);
    }
}
