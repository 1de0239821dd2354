using System.Diagnostics;
using System.Globalization;
using System.Text.Json;

namespace IndexKeeper.Benchmarks;

/// <summary>The real <c>indexkeeper run</c> process on a free loopback port, with CPU and memory read from /proc (proc(5)).</summary>
internal sealed class DaemonProcess : IDisposable
{
    private readonly Process process;
    private readonly HttpClient client;
    private readonly ManualResetEventSlim warmed;

    private DaemonProcess(Process process, Uri url, ManualResetEventSlim warmed)
    {
        this.process = process;
        this.warmed = warmed;
        client = new HttpClient { BaseAddress = url, Timeout = TimeSpan.FromMinutes(2) };
    }

    /// <summary>Wall seconds, CPU share of one core, and peak resident memory over a sampled period.</summary>
    public sealed record Usage(double Seconds, double CpuShare, double PeakRssMegabytes);

    /// <param name="program">Another build's indexkeeper.dll (a baseline measured beside this one); this build's by default.</param>
    public static DaemonProcess Start(string workingDirectory, IReadOnlyList<string> args, string? program = null)
    {
        var endpointFile = Path.Combine(workingDirectory, "index", "daemon.json");
        Directory.CreateDirectory(Path.GetDirectoryName(endpointFile)!);
        File.Delete(endpointFile);
        var start = new ProcessStartInfo("dotnet") { WorkingDirectory = workingDirectory, RedirectStandardError = true, RedirectStandardOutput = true };
        foreach (var arg in new[] { program ?? Path.Combine(AppContext.BaseDirectory, "indexkeeper.dll"), "run", "--index", "index", "--listen", "127.0.0.1:0" }.Concat(args))
        {
            start.ArgumentList.Add(arg);
        }

        var process = Process.Start(start)!;
        var warmed = new ManualResetEventSlim();
        // The daemon's log goes beside the work folder (which is deleted at the end) for a look after a failure.
        var log = new StreamWriter(Path.Combine(Path.GetTempPath(), "indexkeeper-bench-daemon.log"), append: true) { AutoFlush = true };
        process.ErrorDataReceived += (_, e) =>
        {
            if (e.Data is not null)
            {
                lock (log)
                {
                    log.WriteLine(e.Data);
                }

                // IndexWorker's start-up warm-up logs its end, done or failed (docs/daemon.md).
                if (e.Data.Contains("Serving view warmed", StringComparison.Ordinal) || e.Data.Contains("serving view was not warmed", StringComparison.Ordinal))
                {
                    warmed.Set();
                }
            }
        };
        process.OutputDataReceived += (_, _) => { };
        process.BeginErrorReadLine();
        process.BeginOutputReadLine();
        var clock = Stopwatch.StartNew();
        while (clock.Elapsed < TimeSpan.FromMinutes(2))
        {
            if (File.Exists(endpointFile))
            {
                try
                {
                    using var json = JsonDocument.Parse(File.ReadAllText(endpointFile));
                    return new DaemonProcess(process, new Uri(json.RootElement.GetProperty("url").GetString()!), warmed);
                }
                catch (Exception ex) when (ex is IOException or JsonException)
                {
                    // Being written: look again.
                }
            }

            if (process.HasExited)
            {
                throw new InvalidOperationException($"indexkeeper run exited {process.ExitCode}");
            }

            Thread.Sleep(50);
        }

        process.Kill(entireProcessTree: true);
        throw new TimeoutException("indexkeeper run did not start");
    }

    /// <summary>Whether the daemon logged the end of its start-up warm-up search (which builds or reads the serving view).</summary>
    public bool Warmed => warmed.IsSet;

    public JsonElement Get(string path)
    {
        var body = Text(path);
        using var json = JsonDocument.Parse(body);
        return json.RootElement.Clone();
    }

    /// <summary>A GET's body as text (e.g. /metrics).</summary>
    public string Text(string path) => client.GetStringAsync(path).GetAwaiter().GetResult();

    /// <summary>A GET whose status is the answer (a refused request is a figure, not an exception); the body is read and dropped.</summary>
    public int StatusOf(string path)
    {
        using var response = client.GetAsync(path).GetAwaiter().GetResult();
        response.Content.ReadAsByteArrayAsync().GetAwaiter().GetResult();
        return (int)response.StatusCode;
    }

    /// <summary>CPU seconds (user + system) the process has used so far.</summary>
    public double CpuSeconds => CpuTicks() / 100.0; // USER_HZ, from memory: 100 on Linux x86-64 and arm64.

    public void WaitUntil(TimeSpan limit, Func<bool> condition, int pollMilliseconds = 200)
    {
        var clock = Stopwatch.StartNew();
        while (!condition())
        {
            if (clock.Elapsed > limit || process.HasExited)
            {
                throw new TimeoutException("the daemon did not get there in " + limit);
            }

            Thread.Sleep(pollMilliseconds);
        }
    }

    /// <summary>Samples CPU time and resident memory every 100 ms until <paramref name="done"/> holds or <paramref name="length"/> passes.</summary>
    public Usage Sample(Func<bool> done, TimeSpan length)
    {
        var ticksPerSecond = 100.0; // USER_HZ, from memory: 100 on Linux x86-64 and arm64.
        var cpuBefore = CpuTicks();
        var peak = 0L;
        var clock = Stopwatch.StartNew();
        while (clock.Elapsed < length)
        {
            peak = Math.Max(peak, RssKilobytes());
            if (done())
            {
                break;
            }

            Thread.Sleep(100);
        }

        var seconds = clock.Elapsed.TotalSeconds;
        var cpu = (CpuTicks() - cpuBefore) / ticksPerSecond;
        return new Usage(seconds, cpu / seconds, peak / 1024.0);
    }

    public void Stop()
    {
        using (var kill = Process.Start("kill", ["-TERM", process.Id.ToString(CultureInfo.InvariantCulture)]))
        {
            kill.WaitForExit();
        }

        process.WaitForExit(TimeSpan.FromMinutes(1));
    }

    public void Dispose()
    {
        client.Dispose();
        warmed.Dispose();
        if (!process.HasExited)
        {
            process.Kill(entireProcessTree: true);
        }

        process.Dispose();
    }

    /// <summary>utime + stime of the process (fields 14 and 15 of /proc/PID/stat), in clock ticks.</summary>
    private long CpuTicks()
    {
        var stat = File.ReadAllText($"/proc/{process.Id}/stat");
        var fields = stat[(stat.LastIndexOf(')') + 2)..].Split(' ');
        return long.Parse(fields[11], CultureInfo.InvariantCulture) + long.Parse(fields[12], CultureInfo.InvariantCulture);
    }

    /// <summary>The highest resident memory since the process started (VmHWM of /proc/PID/status, proc(5)), in MiB.</summary>
    public double PeakRssSinceStartMegabytes => StatusKilobytes("VmHWM:") / 1024.0;

    private long RssKilobytes() => StatusKilobytes("VmRSS:");

    private long StatusKilobytes(string field)
    {
        var line = File.ReadLines($"/proc/{process.Id}/status").FirstOrDefault(l => l.StartsWith(field, StringComparison.Ordinal));
        return line is null ? 0 : long.Parse(line.Split(' ', StringSplitOptions.RemoveEmptyEntries)[1], CultureInfo.InvariantCulture);
    }
}
