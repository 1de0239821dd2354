using IndexKeeper.Core.Documents.Isolation;

namespace IndexKeeper.Cli;

internal static class Program
{
    private static int Main(string[] args)
    {
        // Hidden: the supervised child process that reads documents (docs/reader-worker.md).
        if (args is [ReaderWorkerCommand.Verb])
        {
            return ReadWorkerHost.RunOverStandardStreams();
        }

        Console.Error.WriteLine("indexkeeper: under construction");
        return args.Length == 0 ? 2 : 0;
    }
}
