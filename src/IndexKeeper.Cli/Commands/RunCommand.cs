using IndexKeeper.Service.Daemon;

namespace IndexKeeper.Cli.Commands;

/// <summary><c>run [--listen HOST:PORT]</c>: the daemon — watch, scan, embed, compact, serve the API (DaemonHost).</summary>
internal sealed class RunCommand() : CommandBase(
    "run",
    "the daemon: watch roots, keep the index fresh, serve metrics, health, status page and API (--listen HOST:PORT)", "listen")
{
    public override int Run(CommandContext context, CancellationToken cancellationToken)
    {
        if (context.Arguments.Named.TryGetValue("listen", out var listen))
        {
            context.Arguments.Overrides.Add("Daemon:Listen=" + listen);
        }

        var options = context.LoadOptions();
        return DaemonHost.RunAsync(options, cancellationToken).GetAwaiter().GetResult();
    }
}
