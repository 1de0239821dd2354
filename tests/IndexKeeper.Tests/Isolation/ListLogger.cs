using Microsoft.Extensions.Logging;

namespace IndexKeeper.Tests.Isolation;

/// <summary>A logger that keeps every formatted message, for assertions.</summary>
internal sealed class ListLogger : ILogger
{
    private readonly Lock gate = new();
    private readonly List<string> messages = [];

    public IReadOnlyList<string> Messages
    {
        get
        {
            lock (gate)
            {
                return [.. messages];
            }
        }
    }

    public IDisposable? BeginScope<TState>(TState state)
        where TState : notnull => null;

    public bool IsEnabled(LogLevel logLevel) => true;

    public void Log<TState>(LogLevel logLevel, EventId eventId, TState state, Exception? exception, Func<TState, Exception?, string> formatter)
    {
        lock (gate)
        {
            messages.Add($"{logLevel}: {formatter(state, exception)}");
        }
    }
}
