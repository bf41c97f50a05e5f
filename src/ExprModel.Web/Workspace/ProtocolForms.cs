namespace ExprModel.Web.Workspace;

/// <summary>The protocols the Workbench's protocols area offers and the settings each form asks for (currents in uA/cm2, times in ms).</summary>
public static class ProtocolForms
{
    public const string Pulse = "pulse", Train = "train", Ramp = "ramp", Noise = "noise", Waveform = "waveform", Clamp = "clamp";

    /// <summary>Kinds in the order of the tabs, with their tab labels.</summary>
    public static IReadOnlyList<(string Kind, string Label)> Kinds { get; } =
    [
        (Pulse, "Brief pulse"), (Train, "Pulse train"), (Ramp, "Ramp"), (Noise, "Noisy current"), (Waveform, "Your waveform"),
        (Clamp, "Voltage clamp"),
    ];

    private static readonly Dictionary<string, IReadOnlyList<ProtocolField>> ByKind = new()
    {
        [Pulse] = [new("amplitude", "amplitude", "µA/cm²", 20, -10_000, 10_000), new("width", "width", "ms", 1, 0.01, 100)],
        [Train] =
        [
            new("amplitude", "amplitude", "µA/cm²", 20, -10_000, 10_000), new("width", "width", "ms", 1, 0.01, 100),
            new("count", "pulses", "", 10, 1, 1000, Whole: true), new("frequency", "frequency", "Hz", 20, 0.1, 1000),
        ],
        [Ramp] =
        [
            new("from", "from", "µA/cm²", 0, -10_000, 10_000), new("to", "to", "µA/cm²", 20, -10_000, 10_000),
            new("duration", "duration", "ms", 1000, 1, 9000),
        ],
        [Noise] =
        [
            new("mean", "mean", "µA/cm²", 5, -10_000, 10_000), new("sd", "SD", "µA/cm²", 3, 0, 10_000),
            new("tau", "correlation time", "ms", 5, 0.05, 1000), new("duration", "duration", "ms", 1000, 1, 9000),
            new("seed", "seed", "", 1, 0, int.MaxValue, Whole: true),
        ],
        [Waveform] = [],
        [Clamp] =
        [
            new("holding", "holding", "mV", -80, -300, 300), new("from", "first command", "mV", -100, -300, 300),
            new("to", "last command", "mV", 40, -300, 300), new("increment", "increment", "mV", 10, 0.1, 100),
            new("command", "command length", "ms", 100, 1, 2000), new("conditioning", "conditioning length", "ms", 500, 1, 5000),
            new("test", "test potential", "mV", 0, -300, 300),
        ],
    };

    public static IReadOnlyList<ProtocolField> Fields(string kind) =>
        ByKind.TryGetValue(kind, out var f) ? f : throw new ArgumentException($"protocol: unknown kind '{kind}'.");

    public static string LabelOf(string kind) => Kinds.FirstOrDefault(k => k.Kind == kind).Label ?? kind;
}
