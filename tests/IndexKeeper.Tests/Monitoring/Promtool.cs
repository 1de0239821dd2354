using System.Diagnostics;

namespace IndexKeeper.Tests.Monitoring;

/// <summary>Debian's Prometheus tools (package prometheus, in the install script's list): promtool and the server.</summary>
internal static class Promtool
{
    public const string Path = "/usr/bin/promtool";

    public const string ServerPath = "/usr/bin/prometheus";

    /// <summary>The shipped rule files and dashboard (config/).</summary>
    public static string ConfigDirectory { get; } = System.IO.Path.Combine(Support.RepositoryRoot.Path, "config");

    /// <summary>Runs promtool with <paramref name="arguments"/> in <paramref name="workingDirectory"/>; exit code and everything it printed.</summary>
    public static (int ExitCode, string Output) Run(string workingDirectory, params string[] arguments)
    {
        var start = new ProcessStartInfo(Path, arguments) { WorkingDirectory = workingDirectory, RedirectStandardOutput = true, RedirectStandardError = true };
        using var process = Process.Start(start)!;
        var stderr = process.StandardError.ReadToEndAsync();
        var output = process.StandardOutput.ReadToEnd();
        process.WaitForExit();
        return (process.ExitCode, output + stderr.GetAwaiter().GetResult());
    }
}
