using System.CommandLine;
using IndexKeeper.Cli.CommandLine;
using IndexKeeper.Service.Daemon;

namespace IndexKeeper.Cli.Commands;

/// <summary><c>run [--listen HOST:PORT]</c>: the daemon — watch, scan, embed, compact, serve the API (DaemonHost).</summary>
internal sealed class RunCommand() : CommandBase(
    "run",
    "the daemon: watch roots, keep the index fresh, serve metrics, health, status page and API")
{
    private readonly Option<string?> listen = LastValue.Wins(new("--listen")
    {
        Description = "where the API listens (the setting Daemon:Listen; default 127.0.0.1:7717); off loopback a token is needed",
        HelpName = "HOST:PORT",
    });

    public override IEnumerable<Symbol> Symbols => [listen];

    public override int Run(CommandContext context, CancellationToken cancellationToken)
    {
        if (context.Value(listen) is { } address)
        {
            context.Overrides.Add("Daemon:Listen=" + address);
        }

        var options = context.LoadOptions();
        return DaemonHost.RunAsync(options, cancellationToken).GetAwaiter().GetResult();
    }
}
