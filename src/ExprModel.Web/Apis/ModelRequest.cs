using System.Text.Json;
using ExprModel.Core.Models;
using ExprModel.Web.Simulation;

namespace ExprModel.Web.Apis;

/// <summary>A request that carries a model file (the app's own JSON model format) as a JSON object.</summary>
public abstract record ModelRequest
{
    /// <summary>The model file as a JSON object (format "exprmodel-model").</summary>
    public JsonElement? Model { get; init; }

    internal ModelDocument ReadModel()
    {
        if (Model is not { ValueKind: JsonValueKind.Object } m) throw new UserInputException("model: required, as a JSON object in the model-file format.");
        return ModelRunner.Parse(m.GetRawText(), "request body, field 'model'");
    }

    internal static JsonElement ToElement(ModelDocument doc) => JsonDocument.Parse(doc.ToJson()).RootElement.Clone();
}
