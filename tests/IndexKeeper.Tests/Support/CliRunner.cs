using System.Diagnostics;

namespace IndexKeeper.Tests.Support;

/// <summary>Runs the real <c>indexkeeper</c> executable built beside the tests, as a user would.</summary>
internal static class CliRunner
{
    public sealed record Result(int ExitCode, string Stdout, string Stderr);

    /// <summary>How to start <c>dotnet indexkeeper.dll ARGS</c> with both output streams redirected.</summary>
    /// <param name="shippedEncoder">Leave the encoder to the shipped default instead of naming the fast one.</param>
    public static ProcessStartInfo StartInfo(string workingDirectory, IEnumerable<string> args, bool shippedEncoder = false)
    {
        var start = new ProcessStartInfo("dotnet")
        {
            WorkingDirectory = workingDirectory,
            RedirectStandardOutput = true,
            RedirectStandardError = true,
            UseShellExecute = false,
        };
        // Tests drive the machinery with the fast training-free encoder unless they test the default one;
        // a command-line --encoder still wins over this environment setting.
        if (!shippedEncoder)
        {
            start.Environment["INDEXKEEPER_Encoder__Name"] = "hashed-terms";
        }

        start.ArgumentList.Add(Path.Combine(AppContext.BaseDirectory, "indexkeeper.dll"));
        foreach (var arg in args)
        {
            start.ArgumentList.Add(arg);
        }

        return start;
    }

    public static Result Run(string workingDirectory, params string[] args) => Run(workingDirectory, shippedEncoder: false, args);

    public static Result Run(string workingDirectory, bool shippedEncoder, params string[] args) =>
        Run(workingDirectory, new Dictionary<string, string>(), shippedEncoder, args);

    /// <summary>Runs with extra environment variables (a fault armed for a crash test).</summary>
    public static Result Run(string workingDirectory, IReadOnlyDictionary<string, string> environment, bool shippedEncoder, params string[] args)
    {
        var start = StartInfo(workingDirectory, args, shippedEncoder);
        foreach (var (name, value) in environment)
        {
            start.Environment[name] = value;
        }

        using var process = Process.Start(start)!;
        var stdout = process.StandardOutput.ReadToEndAsync();
        var stderr = process.StandardError.ReadToEndAsync();
        if (!process.WaitForExit(TimeSpan.FromMinutes(5)))
        {
            process.Kill(entireProcessTree: true);
            throw new TimeoutException("indexkeeper " + string.Join(' ', args) + " did not finish in 5 minutes");
        }

        return new Result(process.ExitCode, stdout.Result, stderr.Result);
    }
}
