namespace IndexKeeper.Cli.CommandLine;

/// <summary>Bad command-line usage the parser cannot see (an empty query, a demo folder not ours); exit code 2 with the message and a pointer to --help.</summary>
internal sealed class UsageException(string message) : Exception(message);
