using System.Diagnostics;
using System.Globalization;

namespace IndexKeeper.Benchmarks;

/// <summary>Wall and CPU time of a piece of work, and the machine's load: the machine is shared, so both times are reported.</summary>
internal static class Measure
{
    /// <summary>Wall seconds and CPU seconds of this process (all its threads) spent in <paramref name="run"/>.</summary>
    public static (double Wall, double Cpu) Once(Action run)
    {
        using var self = Process.GetCurrentProcess();
        var cpuBefore = self.TotalProcessorTime;
        var watch = Stopwatch.StartNew();
        run();
        watch.Stop();
        self.Refresh();
        return (watch.Elapsed.TotalSeconds, (self.TotalProcessorTime - cpuBefore).TotalSeconds);
    }

    /// <summary>
    /// Medians of wall and CPU seconds (taken apart) of <paramref name="repeats"/> runs after one untimed
    /// warm-up run; <paramref name="prepare"/>, untimed, goes before each run.
    /// </summary>
    public static (double Wall, double Cpu) Median(int repeats, Action run, Action? prepare = null)
    {
        prepare?.Invoke();
        run();
        var times = new List<(double Wall, double Cpu)>();
        for (var i = 0; i < repeats; i++)
        {
            prepare?.Invoke();
            times.Add(Once(run));
        }

        return (MedianOf(times.Select(t => t.Wall)), MedianOf(times.Select(t => t.Cpu)));
    }

    /// <summary>The 1-minute load average from /proc/loadavg (proc(5)); NaN where there is none.</summary>
    public static double LoadAverage()
    {
        try
        {
            return double.Parse(File.ReadAllText("/proc/loadavg").Split(' ')[0], CultureInfo.InvariantCulture);
        }
        catch (Exception e) when (e is IOException or UnauthorizedAccessException or FormatException)
        {
            return double.NaN;
        }
    }

    /// <summary>
    /// Empties the page cache, dentries and inodes (writes back dirty pages first: drop_caches only drops
    /// clean ones, proc(5)); false with the reason when this process may not.
    /// </summary>
    public static bool TryDropCaches(out string reason)
    {
        try
        {
            using (var sync = Process.Start(new ProcessStartInfo("sync") { UseShellExecute = false }))
            {
                sync?.WaitForExit();
            }

            File.WriteAllText("/proc/sys/vm/drop_caches", "3");
            reason = string.Empty;
            return true;
        }
        catch (Exception e) when (e is IOException or UnauthorizedAccessException or System.ComponentModel.Win32Exception)
        {
            reason = e.Message;
            return false;
        }
    }

    /// <summary>Wall seconds of one run that starts with empty caches; call only after <see cref="TryDropCaches"/> succeeded once.</summary>
    public static double Cold(Action run)
    {
        TryDropCaches(out _);
        return Once(run).Wall;
    }

    private static double MedianOf(IEnumerable<double> values)
    {
        var sorted = values.Order().ToList();
        return sorted.Count % 2 == 1 ? sorted[sorted.Count / 2] : (sorted[(sorted.Count / 2) - 1] + sorted[sorted.Count / 2]) / 2;
    }
}
