using System.Globalization;
using Spectre.Console;
using Spectre.Console.Rendering;

namespace IndexKeeper.Cli.Output;

/// <summary>Items (files or pages, as the phase counts them) per second, from Spectre's own speed estimate of the task.</summary>
internal sealed class RateColumn : ProgressColumn
{
    public override IRenderable Render(RenderOptions options, ProgressTask task, TimeSpan deltaTime)
    {
        ArgumentNullException.ThrowIfNull(task);
        return task.IsIndeterminate || task.Speed is not { } speed
            ? new Text(string.Empty)
            : new Text(string.Create(CultureInfo.InvariantCulture, $"{speed,7:0.0}/s"), new Style(Color.Grey));
    }
}
