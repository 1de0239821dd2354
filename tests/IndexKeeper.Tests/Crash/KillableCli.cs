using System.Collections.Concurrent;
using System.Diagnostics;

namespace IndexKeeper.Tests.Crash;

/// <summary>
/// Starts the real <c>indexkeeper</c> executable (as <see cref="Support.CliRunner"/> does) and kills it
/// with SIGKILL (the whole process tree, reader workers included) a delay after a <see cref="KillTrigger"/>.
/// </summary>
internal static class KillableCli
{
    /// <summary>What happened to one run: killed (and where), or finished before the kill came.</summary>
    public sealed record Outcome(bool Killed, int? ExitCode, bool Triggered, TimeSpan At, string LastProgress, string Stdout, string Stderr);

    private static readonly TimeSpan Limit = TimeSpan.FromMinutes(2);

    public static Outcome RunAndKill(string workingDirectory, KillTrigger trigger, TimeSpan delay, IReadOnlyList<string> args)
    {
        var start = Support.CliRunner.StartInfo(workingDirectory, args);

        var stderr = new ConcurrentQueue<string>();
        var stdout = new ConcurrentQueue<string>();
        var marker = trigger.StderrMarker;
        using var markerSeen = new ManualResetEventSlim(marker is null && trigger.Condition is null);
        using var process = new Process { StartInfo = start };
        process.ErrorDataReceived += (_, e) =>
        {
            if (e.Data is null)
            {
                return;
            }

            stderr.Enqueue(e.Data);
            if (marker is not null && e.Data.Contains(marker, StringComparison.Ordinal))
            {
                markerSeen.Set();
            }
        };
        process.OutputDataReceived += (_, e) =>
        {
            if (e.Data is not null)
            {
                stdout.Enqueue(e.Data);
            }
        };

        var clock = Stopwatch.StartNew();
        process.Start();
        process.BeginErrorReadLine();
        process.BeginOutputReadLine();

        // Wait for the trigger or the end of the process, whichever comes first, then for the delay.
        while (!markerSeen.IsSet && !process.HasExited && clock.Elapsed < Limit)
        {
            if (trigger.Condition is { } condition)
            {
                if (condition())
                {
                    markerSeen.Set();
                }
                else
                {
                    // Yield rather than sleep: a seal takes about a millisecond from its write to its catalog record.
                    Thread.Yield();
                }
            }
            else
            {
                markerSeen.Wait(TimeSpan.FromMilliseconds(5));
            }
        }

        var seen = markerSeen.IsSet;
        var killed = false;
        if (seen && !process.WaitForExit(delay))
        {
            process.Kill(entireProcessTree: true);
            killed = true;
        }

        var at = clock.Elapsed;
        if (!process.WaitForExit(Limit))
        {
            process.Kill(entireProcessTree: true);
            throw new TimeoutException("indexkeeper " + string.Join(' ', args) + $" did not finish in {Limit}");
        }

        // The parameterless wait drains the redirected streams.
        process.WaitForExit();
        var lastProgress = stderr.LastOrDefault(l => l.Contains(':', StringComparison.Ordinal)) ?? "(no progress yet)";
        return new Outcome(killed, killed ? null : process.ExitCode, seen, at, lastProgress, string.Join('\n', stdout), string.Join('\n', stderr));
    }
}
