using System.Diagnostics;
using IndexKeeper.Core.Pipeline;

namespace IndexKeeper.Cli.Output;

/// <summary>
/// Progress on stderr: a redrawn bar on a terminal, a plain line every few seconds when redirected
/// (logs and CI keep readable lines). Throttled so a fast scan does not spend its time printing.
/// </summary>
internal sealed class TerminalProgress : IProgress<ScanProgress>, IDisposable
{
    private static readonly TimeSpan TerminalInterval = TimeSpan.FromMilliseconds(100);
    private static readonly TimeSpan PlainInterval = TimeSpan.FromSeconds(5);
    private readonly bool terminal = !Console.IsErrorRedirected;
    private readonly Stopwatch sinceLast = Stopwatch.StartNew();
    private string lastPhase = string.Empty;
    private bool drawn;

    /// <summary>Runs <paramref name="work"/> with a progress bar, cleared before its result is printed.</summary>
    public static T Around<T>(Func<IProgress<ScanProgress>, T> work)
    {
        ArgumentNullException.ThrowIfNull(work);
        using var progress = new TerminalProgress();
        return work(progress);
    }

    public void Report(ScanProgress value)
    {
        var phaseChanged = value.Phase != lastPhase;
        if (!phaseChanged && sinceLast.Elapsed < (terminal ? TerminalInterval : PlainInterval) && value.Done != value.Total)
        {
            return;
        }

        lastPhase = value.Phase;
        sinceLast.Restart();
        if (terminal)
        {
            var width = 30;
            var filled = value.Total > 0 ? (int)(width * value.Done / value.Total) : 0;
            var bar = value.Total > 0 ? $"[{new string('#', filled)}{new string('.', width - filled)}] {value.Done}/{value.Total}" : value.Done > 0 ? $"{value.Done}" : string.Empty;
            var line = $"{value.Phase,-9} {bar} {Shorten(TerminalText.Escape(value.Current), 40)}";
            var room = SafeWidth() - 1;
            Console.Error.Write("\r" + (line.Length >= room ? line[..room] : line.PadRight(room)));
            drawn = true;
        }
        else if (phaseChanged || value.Total > 0)
        {
            Console.Error.WriteLine(value.Total > 0 ? $"{value.Phase}: {value.Done}/{value.Total}" : value.Done > 0 ? $"{value.Phase}: {value.Done}" : value.Phase);
        }
    }

    public void Dispose()
    {
        if (drawn)
        {
            Console.Error.Write("\r" + new string(' ', Math.Max(0, SafeWidth() - 1)) + "\r");
        }
    }

    private static string Shorten(string? text, int max) =>
        text is null ? string.Empty : text.Length <= max ? text : "…" + text[^(max - 1)..];

    private static int SafeWidth()
    {
        try
        {
            return Console.WindowWidth > 20 ? Console.WindowWidth : 100;
        }
        catch (IOException)
        {
            return 100;
        }
    }
}
