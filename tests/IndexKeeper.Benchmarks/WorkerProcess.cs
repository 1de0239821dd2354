using System.Collections.Concurrent;
using System.Diagnostics;
using System.Globalization;

namespace IndexKeeper.Benchmarks;

/// <summary>
/// A real <c>indexkeeper worker</c> process (this build's, or <paramref name="program"/>'s) with its CPU read from
/// /proc (proc(5)); stopped by SIGTERM, after which its time-by-stage line (<c>WorkerStages</c>) is read from its log.
/// </summary>
internal sealed class WorkerProcess : IDisposable
{
    private const string StagesMarker = "time by stage: ";
    private readonly Process process;
    private readonly ConcurrentQueue<string> stderr = new();

    public WorkerProcess(string folder, IReadOnlyList<string> args, string? program = null)
    {
        var start = new ProcessStartInfo("dotnet") { WorkingDirectory = folder, RedirectStandardError = true, RedirectStandardOutput = true };
        foreach (var arg in new[] { program ?? Path.Combine(AppContext.BaseDirectory, "indexkeeper.dll"), "worker" }.Concat(args))
        {
            start.ArgumentList.Add(arg);
        }

        process = Process.Start(start)!;
        process.ErrorDataReceived += (_, e) =>
        {
            if (e.Data is not null)
            {
                stderr.Enqueue(e.Data);
            }
        };
        process.OutputDataReceived += (_, _) => { };
        process.BeginErrorReadLine();
        process.BeginOutputReadLine();
    }

    /// <summary>CPU seconds (user + system, fields 14 and 15 of /proc/PID/stat) the process has used so far.</summary>
    public double CpuSeconds
    {
        get
        {
            var stat = File.ReadAllText($"/proc/{process.Id}/stat");
            var fields = stat[(stat.LastIndexOf(')') + 2)..].Split(' ');
            return (long.Parse(fields[11], CultureInfo.InvariantCulture) + long.Parse(fields[12], CultureInfo.InvariantCulture)) / 100.0; // USER_HZ, from memory: 100
        }
    }

    /// <summary>A worker that ended by itself mid-run (a run would otherwise wait out its hour for pages nobody embeds): its exit code and last log lines.</summary>
    public void ThrowIfExited()
    {
        if (process.HasExited)
        {
            throw new InvalidOperationException($"a worker exited mid-run with code {process.ExitCode}:\n" + string.Join('\n', stderr.TakeLast(30)));
        }
    }

    /// <summary>SIGTERM, as a service manager stops it; its seconds by stage (empty for a build that does not log them).</summary>
    public Dictionary<string, double> Stop()
    {
        if (!process.HasExited)
        {
            using var kill = Process.Start("kill", ["-TERM", process.Id.ToString(CultureInfo.InvariantCulture)])!;
            kill.WaitForExit();
        }

        if (!process.WaitForExit(TimeSpan.FromMinutes(1)))
        {
            throw new TimeoutException("the worker did not stop within a minute of SIGTERM");
        }

        process.WaitForExit();
        var line = stderr.LastOrDefault(l => l.Contains(StagesMarker, StringComparison.Ordinal));
        return line is null ? [] : line[(line.IndexOf(StagesMarker, StringComparison.Ordinal) + StagesMarker.Length)..]
            .Split(' ', StringSplitOptions.RemoveEmptyEntries)
            .Select(pair => pair.Split('='))
            .ToDictionary(p => p[0], p => double.Parse(p[1], CultureInfo.InvariantCulture));
    }

    public void Dispose()
    {
        if (!process.HasExited)
        {
            process.Kill(entireProcessTree: true);
            process.WaitForExit();
        }

        process.Dispose();
    }
}
