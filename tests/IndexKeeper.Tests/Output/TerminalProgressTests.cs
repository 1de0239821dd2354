using IndexKeeper.Cli.Output;
using IndexKeeper.Core.Pipeline;
using Spectre.Console.Testing;

namespace IndexKeeper.Tests.Output;

/// <summary>The progress display of a pass: Spectre.Console on a terminal, plain lines when stderr is redirected.</summary>
public sealed class TerminalProgressTests
{
    [Fact]
    public void A_terminal_shows_each_phase_with_its_percentage_and_names_escaped()
    {
        var console = new TestConsole().Interactive().Width(160);

        var result = TerminalProgress.Around(console, progress =>
        {
            progress.Report(new ScanProgress("checking", 1, 4, "reports/\u001b[2Jwiped.pdf"));
            progress.Report(new ScanProgress("embedding", 30, 40, null));
            return 7;
        });

        Assert.Equal(7, result);
        Assert.Contains("checking", console.Output, StringComparison.Ordinal);
        Assert.Contains("embedding", console.Output, StringComparison.Ordinal);
        Assert.Contains("75%", console.Output, StringComparison.Ordinal);

        // The name's ESC is shown as \x1B (TerminalText), never sent to the terminal.
        Assert.Contains("\\x1B[2Jwiped.pdf", console.Output, StringComparison.Ordinal);
        Assert.DoesNotContain("\u001b[2J", console.Output, StringComparison.Ordinal);
    }

    [Fact]
    public void Redirected_progress_is_one_plain_line_per_phase()
    {
        using var output = new StringWriter();
        var progress = new PlainProgress(output);

        progress.Report(new ScanProgress("walking", 1, 0, "a.pdf"));
        progress.Report(new ScanProgress("walking", 2, 0, "b.pdf"));
        progress.Report(new ScanProgress("embedding", 3, 3, null));

        Assert.Equal(["walking: 1", "embedding: 3/3"], output.ToString().Split(Environment.NewLine, StringSplitOptions.RemoveEmptyEntries));
    }
}
