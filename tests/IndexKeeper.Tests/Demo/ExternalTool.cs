using System.Diagnostics;
using System.Globalization;
using System.Text.RegularExpressions;

namespace IndexKeeper.Tests.Demo;

/// <summary>Runs an independent command-line tool (Debian's qpdf, poppler-utils, libtiff-tools) and
/// returns its exit code and standard output.</summary>
internal static partial class ExternalTool
{
    public static (int ExitCode, string Output) Run(string fileName, params string[] arguments)
    {
        var start = new ProcessStartInfo(fileName)
        {
            RedirectStandardOutput = true,
            RedirectStandardError = true,
            UseShellExecute = false,
        };
        foreach (string argument in arguments)
        {
            start.ArgumentList.Add(argument);
        }

        using var process = Process.Start(start) ?? throw new InvalidOperationException($"could not start {fileName}");
        var error = process.StandardError.ReadToEndAsync();
        string output = process.StandardOutput.ReadToEnd();
        process.WaitForExit();
        return (process.ExitCode, output + error.Result);
    }

    /// <summary>The page count poppler-utils' pdfinfo prints ("Pages:  N").</summary>
    public static int PdfinfoPageCount(string path)
    {
        var (exitCode, output) = Run("pdfinfo", path);
        if (exitCode != 0)
        {
            throw new InvalidOperationException($"pdfinfo failed on {path} with exit {exitCode}: {output}");
        }

        return int.Parse(PagesLine().Match(output).Groups[1].Value, CultureInfo.InvariantCulture);
    }

    [GeneratedRegex(@"^Pages:\s+(\d+)", RegexOptions.Multiline)]
    private static partial Regex PagesLine();
}
