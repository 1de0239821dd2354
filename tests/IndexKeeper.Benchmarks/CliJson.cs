using System.Diagnostics;
using System.Text.Json;

namespace IndexKeeper.Benchmarks;

/// <summary>Runs one command of the built executable with <c>--json</c> output as an operator would, and returns its answer.</summary>
internal static class CliJson
{
    public static JsonElement Run(string folder, params string[] args) => Run(folder, partialFailureAllowed: false, args);

    /// <param name="partialFailureAllowed">Take exit 1 (partial failure, e.g. a document quarantined) as an answer too.</param>
    public static JsonElement Run(string folder, bool partialFailureAllowed, params string[] args)
    {
        var start = new ProcessStartInfo("dotnet") { WorkingDirectory = folder, RedirectStandardError = true, RedirectStandardOutput = true };
        foreach (var arg in new[] { Path.Combine(AppContext.BaseDirectory, "indexkeeper.dll") }.Concat(args))
        {
            start.ArgumentList.Add(arg);
        }

        using var process = Process.Start(start)!;
        var stderr = process.StandardError.ReadToEndAsync();
        var stdout = process.StandardOutput.ReadToEnd();
        process.WaitForExit();
        if (process.ExitCode != 0 && !(partialFailureAllowed && process.ExitCode == 1))
        {
            throw new InvalidOperationException($"indexkeeper {args[0]} exited {process.ExitCode}: {stdout}\n{stderr.Result}");
        }

        using var json = JsonDocument.Parse(stdout);
        return json.RootElement.Clone();
    }
}
