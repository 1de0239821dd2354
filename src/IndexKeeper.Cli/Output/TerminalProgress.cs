using IndexKeeper.Core.Pipeline;
using Spectre.Console;

namespace IndexKeeper.Cli.Output;

/// <summary>
/// Progress of a pass, always on stderr (stdout keeps the answer, or only JSON with <c>--json</c>): on a
/// terminal a Spectre.Console display per phase with percentage, pages or files per second and time left
/// (<see cref="ProgressTasks"/>), cleared before the result is printed; redirected, plain lines (<see cref="PlainProgress"/>).
/// </summary>
internal static class TerminalProgress
{
    /// <summary>Runs <paramref name="work"/> under the progress display fitting stderr.</summary>
    public static T Around<T>(Func<IProgress<ScanProgress>, T> work)
    {
        ArgumentNullException.ThrowIfNull(work);
        return Console.IsErrorRedirected
            ? work(new PlainProgress(Console.Error))
            : Around(AnsiConsole.Create(new AnsiConsoleSettings { Out = new AnsiConsoleOutput(Console.Error) }), work);
    }

    /// <summary>As <see cref="Around{T}(Func{IProgress{ScanProgress}, T})"/> on a given console (tests draw on a recording one).</summary>
    public static T Around<T>(IAnsiConsole console, Func<IProgress<ScanProgress>, T> work)
    {
        ArgumentNullException.ThrowIfNull(work);
        return console.Progress()
            .AutoClear(true)
            .Columns(new TaskDescriptionColumn { Alignment = Justify.Left }, new ProgressBarColumn { Width = 16 }, new PercentageColumn(), new RateColumn(), new RemainingTimeColumn(), new SpinnerColumn())
            .Start(context =>
            {
                var result = work(new ProgressTasks(context));

                // The last figures are drawn once for sure, not only if a timed redraw came after them.
                context.Refresh();
                return result;
            });
    }
}
