using IndexKeeper.Service.Daemon;

namespace IndexKeeper.Cli.Commands;

/// <summary><c>run [--listen HOST:PORT]</c>: the daemon — watch, scan, embed, compact, serve the API (DaemonHost).</summary>
internal sealed class RunCommand : ICommand
{
    public string Name => "run";

    public string Summary => "the daemon: watch roots, keep the index fresh, serve metrics, health, status page and API (--listen HOST:PORT)";

    public IReadOnlySet<string> Options { get; } = new HashSet<string> { "listen" };

    public int Run(CommandContext context, CancellationToken cancellationToken)
    {
        if (context.Arguments.Named.TryGetValue("listen", out var listen))
        {
            context.Arguments.Overrides.Add("Daemon:Listen=" + listen);
        }

        var options = context.LoadOptions();
        return DaemonHost.RunAsync(options, cancellationToken).GetAwaiter().GetResult();
    }
}
