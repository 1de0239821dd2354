using System.Collections.Concurrent;
using System.Diagnostics;
using IndexKeeper.Tests.Support;

namespace IndexKeeper.Tests.WorkQueue;

/// <summary>A real <c>indexkeeper worker</c> process with its stderr kept; stopped by SIGTERM or killed on dispose.</summary>
internal sealed class RunningWorker : IDisposable
{
    private readonly Process process;
    private readonly ConcurrentQueue<string> stderr = new();

    public RunningWorker(string workingDirectory, IReadOnlyList<string> args, IReadOnlyDictionary<string, string>? environment = null)
    {
        var start = CliRunner.StartInfo(workingDirectory, ["worker", .. args]);
        foreach (var (name, value) in environment ?? new Dictionary<string, string>())
        {
            start.Environment[name] = value;
        }

        process = new Process { StartInfo = start };
        process.ErrorDataReceived += (_, e) =>
        {
            if (e.Data is not null)
            {
                stderr.Enqueue(e.Data);
            }
        };
        process.OutputDataReceived += (_, _) => { };
        process.Start();
        process.BeginErrorReadLine();
        process.BeginOutputReadLine();
    }

    public string Stderr => string.Join('\n', stderr);

    /// <summary>Waits for the process to end by itself (an armed fault), at most <paramref name="within"/>; its exit code.</summary>
    public int WaitForExit(TimeSpan within)
    {
        Assert.True(process.WaitForExit(within), "the worker did not exit in time:\n" + Stderr);
        process.WaitForExit();
        return process.ExitCode;
    }

    /// <summary>SIGTERM, as a service manager stops it; its exit code.</summary>
    public int Terminate()
    {
        if (process.HasExited)
        {
            return process.ExitCode;
        }

        using (var kill = Process.Start("kill", ["-TERM", process.Id.ToString(System.Globalization.CultureInfo.InvariantCulture)]))
        {
            kill.WaitForExit();
        }

        return WaitForExit(TimeSpan.FromSeconds(60));
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
