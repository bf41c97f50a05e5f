using Bunit;
using ExprModel.Core.Stochastic;
using ExprModel.Web.Components.Workbench;

// Not "...Components.Workbench": that namespace would hide the Workbench page type from the page tests beside this folder.
namespace ExprModel.Web.Tests.Components.WorkbenchParts;

/// <summary>The Workbench's protocol panel with the real catalog and simulator.</summary>
public sealed class ProtocolPanelTests : WorkbenchAreaContext
{
    /// <summary>With channel noise on, the note names both methods and the channel count from which diffusion takes over.</summary>
    [Fact]
    public void The_channel_noise_note_names_both_methods_and_the_threshold()
    {
        var session = NewSession();
        session.OpenInitial("hh1952");
        session.SetChannelNoise(true);
        var cut = Render<ProtocolPanel>(p => p.Add(x => x.Session, session));
        string note = System.Text.RegularExpressions.Regex.Replace(cut.Find("[data-testid=channel-noise-note]").TextContent, @"\s+", " ");
        Assert.Contains("diffusion approximation", note);
        Assert.Contains($"at least {ChannelNoiseSettings.DefaultDiffusionFromChannels} channels", note);
        Assert.Contains("Linaro, Storace & Giugliano 2011", note);
        Assert.Contains("binomial updates", note);
    }
}
