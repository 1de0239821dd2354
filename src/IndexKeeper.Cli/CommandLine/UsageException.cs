namespace IndexKeeper.Cli.CommandLine;

/// <summary>Bad command-line usage; exit code 2 with the message and a pointer to --help.</summary>
internal sealed class UsageException(string message) : Exception(message);
