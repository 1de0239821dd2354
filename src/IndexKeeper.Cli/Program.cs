using IndexKeeper.Cli.CommandLine;
using IndexKeeper.Cli.Commands;
using IndexKeeper.Cli.Output;
using IndexKeeper.Core.Catalog;
using IndexKeeper.Core.Storage;
using IndexKeeper.Core.Documents.Isolation;
using IndexKeeper.Service.Configuration;
using IndexKeeper.Service.Daemon;

namespace IndexKeeper.Cli;

/// <summary>The <c>indexkeeper</c> command: parses, dispatches, and maps failures to exit codes (0 ok, 1 problems, 2 bad usage).</summary>
internal static class Program
{
    private static readonly ICommand[] Commands =
    [
        new SyncCommand(), new ScanCommand(), new StatusCommand(), new SearchCommand(), new CompactCommand(), new VerifyCommand(), new RepairCommand(), new RebuildCatalogCommand(), new DemoCommand(),
        new PlanCommand(), new EncodersCommand(), new RunCommand(),
    ];

    private static int Main(string[] args)
    {
        // Hidden: the supervised child process that reads documents (docs/reader-worker.md).
        if (args is [ReaderWorkerCommand.Verb])
        {
            return ReadWorkerHost.RunOverStandardStreams();
        }

        if (args.Length == 0 || args[0] is "--help" or "-h" or "help")
        {
            PrintHelp(Console.Out);
            return args.Length == 0 ? 2 : 0;
        }

        using var cancellation = new CancellationTokenSource();
        Console.CancelKeyPress += (_, e) =>
        {
            // First Ctrl+C asks for a clean stop after the batch in flight; a second one kills.
            e.Cancel = !cancellation.IsCancellationRequested;
            cancellation.Cancel();
        };
        try
        {
            var parsed = ArgumentParser.Parse(args, Commands.ToDictionary(c => c.Name, c => c.Options), Commands.ToDictionary(c => c.Name, c => c.Flags));
            var command = Commands.Single(c => c.Name == parsed.Command);
            if (!parsed.Json)
            {
                Console.SetOut(new TerminalSafeWriter(Console.Out));
            }

            return command.Run(new CommandContext(parsed), cancellation.Token);
        }
        catch (UsageException ex)
        {
            Error($"{ex.Message} (see indexkeeper --help)");
            return 2;
        }
        catch (ConfigurationException ex)
        {
            Error(ex.Message);
            return 2;
        }
        catch (IndexLockedException ex) when (ex.HolderPurpose == DaemonClient.LockPurpose)
        {
            Error(ex.Message + " It is the daemon: it keeps the index fresh itself; status, search and plan ask it, other commands need it stopped.");
            return 1;
        }
        catch (IndexMissingException ex)
        {
            Error(ex.Message);
            return 2;
        }
        catch (Exception ex) when (ex is IndexLockedException or CatalogVersionException or CatalogDamagedException)
        {
            Error(ex.Message);
            return 1;
        }
        catch (SegmentFormatException ex)
        {
            Error($"a segment is damaged: {ex.Message} Run 'indexkeeper verify' to isolate it and queue its pages again.");
            return 1;
        }
        catch (OperationCanceledException)
        {
            Error("stopped; work committed so far is kept.");
            return 1;
        }
        catch (IOException ex)
        {
            // A full or failing disk under the catalog: the batch in flight is lost, committed work is not
            // (the catalog's write-ahead log); a partial failure by the exit-code contract, not a crash.
            Error($"{ex.Message}; work committed so far is kept, run the command again once the disk has room.");
            return 1;
        }
    }

    /// <summary>An error line on stderr; a message may name store paths, so each of its lines is escaped (TerminalText).</summary>
    private static void Error(string message) =>
        Console.Error.WriteLine("indexkeeper: " + string.Join(Environment.NewLine, message.Split(Environment.NewLine).Select(TerminalText.Escape)));

    private static void PrintHelp(TextWriter output)
    {
        output.WriteLine("indexkeeper — keeps a late-interaction page index true to a changing document store");
        output.WriteLine();
        output.WriteLine("usage: indexkeeper <command> [--index DIR] [--root DIR ...] [--config FILE] [--encoder NAME] [--json] [--Section:Key=value ...]");
        output.WriteLine();
        foreach (var command in Commands)
        {
            output.WriteLine($"  {command.Name,-10} {command.Summary}");
        }

        output.WriteLine();
        output.WriteLine("Settings: a JSON file (--config), environment variables INDEXKEEPER_Section__Key, overrides --Section:Key=value.");
        output.WriteLine("Exit codes: 0 ok, 1 problems found or partial failure, 2 bad usage or configuration.");
    }
}
