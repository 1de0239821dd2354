using System.Diagnostics;
using System.Globalization;

namespace IndexKeeper.Service.WorkQueue;

/// <summary>
/// Where a worker's time goes outside its encoder, stage by stage (logged when it stops; the <c>workqueue</c>
/// benchmark reads the line). Only the worker's own thread starts and stops the watches.
/// </summary>
internal sealed class WorkerStages
{
    private readonly Stopwatch running = Stopwatch.StartNew();

    /// <summary>The claim statements, finding jobs or not.</summary>
    public Stopwatch Claiming { get; } = new();

    /// <summary>Turning vectors into result bytes (float16 rows, boxes, CRC-32C).</summary>
    public Stopwatch Writing { get; } = new();

    /// <summary>Hand-backs and failures given back: the statements.</summary>
    public Stopwatch HandingBack { get; } = new();

    /// <summary>Waiting for jobs after a claim found none.</summary>
    public Stopwatch Waiting { get; } = new();

    /// <summary>Runs <paramref name="action"/> with <paramref name="watch"/> running, stopped again however it ends.</summary>
    public static T Time<T>(Stopwatch watch, Func<T> action)
    {
        watch.Start();
        try
        {
            return action();
        }
        finally
        {
            watch.Stop();
        }
    }

    /// <summary>
    /// One line, <c>name=seconds</c> pairs separated by spaces (invariant culture, seconds with three decimals):
    /// total, encode, hash, read, claim, write, handback, wait, other (what none of them holds: the loop, logging, the heartbeat's lock).
    /// </summary>
    public string Describe(double encoderSeconds, (TimeSpan Hashing, TimeSpan Reading) read)
    {
        var total = running.Elapsed.TotalSeconds;
        (string Name, double Seconds)[] parts =
        [
            ("encode", encoderSeconds), ("hash", read.Hashing.TotalSeconds), ("read", read.Reading.TotalSeconds), ("claim", Claiming.Elapsed.TotalSeconds),
            ("write", Writing.Elapsed.TotalSeconds), ("handback", HandingBack.Elapsed.TotalSeconds), ("wait", Waiting.Elapsed.TotalSeconds),
        ];
        var other = total - parts.Sum(p => p.Seconds);
        return string.Join(' ', new[] { ("total", total) }.Concat(parts).Append(("other", other)).Select(p => string.Create(CultureInfo.InvariantCulture, $"{p.Item1}={p.Item2:0.000}")));
    }
}
