using System.Diagnostics;

namespace IndexKeeper.Tests.Detect;

/// <summary>A scratch folder for one test, removed with `rm -rf` (which copes with paths beyond PATH_MAX).</summary>
internal sealed class TempTree : IDisposable
{
    public TempTree()
    {
        Root = Path.Combine(Path.GetTempPath(), "ik-detect-" + Guid.NewGuid().ToString("N"));
        Directory.CreateDirectory(Root);
    }

    public string Root { get; }

    public string PathOf(string relative) => Path.Combine(Root, relative);

    public string Write(string relative, byte[] content)
    {
        var path = PathOf(relative);
        Directory.CreateDirectory(Path.GetDirectoryName(path)!);
        File.WriteAllBytes(path, content);
        return path;
    }

    public string Write(string relative, string content = "x") => Write(relative, System.Text.Encoding.UTF8.GetBytes(content));

    /// <summary>Runs a tool from the system (coreutils, sh) and returns its standard output.</summary>
    public static string Run(string tool, params string[] arguments)
    {
        var start = new ProcessStartInfo(tool) { RedirectStandardOutput = true, RedirectStandardError = true, UseShellExecute = false };
        foreach (var argument in arguments)
        {
            start.ArgumentList.Add(argument);
        }

        using var process = Process.Start(start)!;
        var output = process.StandardOutput.ReadToEnd();
        var error = process.StandardError.ReadToEnd();
        process.WaitForExit();
        if (process.ExitCode != 0)
        {
            throw new InvalidOperationException($"{tool} {string.Join(' ', arguments)} failed ({process.ExitCode}): {error}");
        }

        return output;
    }

    public void Dispose()
    {
        Run("chmod", "-R", "u+rwx", Root);
        Run("rm", "-rf", Root);
    }
}
