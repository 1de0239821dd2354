using IndexKeeper.Core.Pipeline;
using Spectre.Console;

namespace IndexKeeper.Cli.Output;

/// <summary>
/// A pass's progress as Spectre.Console tasks: one line per phase (walking, checking, embedding, …), with
/// the file in hand shown escaped (<see cref="TerminalText"/>: a name cannot act on the terminal, nor on
/// Spectre's markup). A phase without a total is shown without a percentage. Reports are taken one at a
/// time (a lock); Spectre's display redraws from the tasks' values on its own thread.
/// </summary>
internal sealed class ProgressTasks(ProgressContext context) : IProgress<ScanProgress>
{
    private const int NameWidth = 22;
    private readonly Lock gate = new();
    private ProgressTask? task;
    private string phase = string.Empty;

    public void Report(ScanProgress value)
    {
        lock (gate)
        {
            if (task is null || value.Phase != phase)
            {
                task?.StopTask();
                phase = value.Phase;
                task = context.AddTask(Markup.Escape(phase), maxValue: Math.Max(1, value.Total));
            }

            task.IsIndeterminate = value.Total <= 0;
            if (value.Total > 0)
            {
                task.MaxValue = value.Total;
                task.Value = value.Done;
            }

            task.Description = Markup.Escape(value.Current is { } current ? $"{phase} {Shorten(TerminalText.Escape(current))}" : phase);
        }
    }

    private static string Shorten(string text) => text.Length <= NameWidth ? text.PadRight(NameWidth) : "…" + text[^(NameWidth - 1)..];
}
