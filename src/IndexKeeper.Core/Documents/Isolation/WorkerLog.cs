using Microsoft.Extensions.Logging;

namespace IndexKeeper.Core.Documents.Isolation;

/// <summary>Log messages of the reader supervisor.</summary>
internal static partial class WorkerLog
{
    [LoggerMessage(Level = LogLevel.Information, Message = "Reader worker {ProcessId} started: {Command}")]
    public static partial void Started(ILogger logger, int processId, string command);

    [LoggerMessage(Level = LogLevel.Warning, Message = "Reader worker {ProcessId} stopped: {Why}")]
    public static partial void Stopped(ILogger logger, int processId, string why);

    [LoggerMessage(Level = LogLevel.Warning, Message = "Reader worker died on {Path} ({Why}); trying once more with a fresh worker")]
    public static partial void Retrying(ILogger logger, string path, string why);

    [LoggerMessage(Level = LogLevel.Warning, Message = "Reader worker {ProcessId} stderr: {Line}")]
    public static partial void StderrLine(ILogger logger, int processId, string line);

    [LoggerMessage(Level = LogLevel.Warning, Message = "Reader worker {ProcessId} stderr: further lines of this read not logged")]
    public static partial void StderrSuppressed(ILogger logger, int processId);
}
