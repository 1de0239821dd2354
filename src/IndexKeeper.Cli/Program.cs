using IndexKeeper.Cli.CommandLine;
using IndexKeeper.Cli.Commands;
using IndexKeeper.Cli.Output;
using IndexKeeper.Core.Catalog;
using IndexKeeper.Core.Faults;
using IndexKeeper.Core.Storage;
using IndexKeeper.Core.Documents.Isolation;
using IndexKeeper.Service.Configuration;
using IndexKeeper.Service.Daemon;

namespace IndexKeeper.Cli;

/// <summary>The <c>indexkeeper</c> command: parses (IndexKeeperCommandLine), runs, and maps failures to exit codes (0 ok, 1 problems, 2 bad usage, 130 stopped).</summary>
internal static class Program
{
    private static readonly CommandBase[] Commands =
    [
        new SyncCommand(), new ScanCommand(), new StatusCommand(), new SearchCommand(), new CompactCommand(), new VerifyCommand(), new RepairCommand(), new RebuildCatalogCommand(), new ForgetRootCommand(), new DemoCommand(),
        new PlanCommand(), new EncodersCommand(), new RunCommand(), new WorkerCommand(),
    ];

    private static int Main(string[] args)
    {
        // Hidden: the supervised child process that reads documents (docs/reader-worker.md).
        if (args is [ReaderWorkerCommand.Verb])
        {
            return ReadWorkerHost.RunOverStandardStreams();
        }

        // A test facility (docs/fault-matrix.md): a malformed arming is a usage error, never ignored.
        if (FaultInjection.Problem is { } faultProblem)
        {
            Error(faultProblem);
            return 2;
        }

        using var stop = new StopSignals();
        try
        {
            return IndexKeeperCommandLine.Invoke(Commands, args, (command, parsed, settings) =>
            {
                var context = new CommandContext(parsed, settings);
                if (!context.Json)
                {
                    Console.SetOut(new TerminalSafeWriter(Console.Out));
                }

                return command.Run(context, stop.Token);
            });
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
        catch (OperationCanceledException) when (stop.Requested)
        {
            Error("stopped; work committed so far is kept.");
            return StopSignals.ExitCode;
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
}
