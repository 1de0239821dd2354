using System.Diagnostics;
using IndexKeeper.Core.Pipeline;

namespace IndexKeeper.Cli.Output;

/// <summary>
/// Progress on a redirected stderr (logs, CI, a pipe): a plain line when the phase changes and every few
/// seconds, so a log keeps readable lines and a fast scan does not spend its time printing.
/// </summary>
internal sealed class PlainProgress(TextWriter output) : IProgress<ScanProgress>
{
    private static readonly TimeSpan Interval = TimeSpan.FromSeconds(5);
    private readonly Stopwatch sinceLast = Stopwatch.StartNew();
    private string lastPhase = string.Empty;

    public void Report(ScanProgress value)
    {
        var phaseChanged = value.Phase != lastPhase;
        if (!phaseChanged && sinceLast.Elapsed < Interval && value.Done != value.Total)
        {
            return;
        }

        lastPhase = value.Phase;
        sinceLast.Restart();
        if (phaseChanged || value.Total > 0)
        {
            output.WriteLine(value.Total > 0 ? $"{value.Phase}: {value.Done}/{value.Total}" : value.Done > 0 ? $"{value.Phase}: {value.Done}" : value.Phase);
        }
    }
}
