using System.Diagnostics;

namespace IndexKeeper.Tests.Documents;

/// <summary>
/// Runs Debian's qpdf, the independent tool that rewrites PDFs without changing what their pages show.
/// CI installs it; a missing qpdf fails the test rather than skipping it.
/// </summary>
internal static class Qpdf
{
    /// <summary>Runs qpdf with <paramref name="arguments"/> and returns its standard output as bytes; exit 0, or 3 (succeeded with warnings), is success.</summary>
    public static byte[] Run(params string[] arguments)
    {
        var start = new ProcessStartInfo("qpdf") { RedirectStandardOutput = true, RedirectStandardError = true };
        foreach (var argument in arguments)
        {
            start.ArgumentList.Add(argument);
        }

        Process process;
        try
        {
            process = Process.Start(start) ?? throw new InvalidOperationException("qpdf did not start");
        }
        catch (System.ComponentModel.Win32Exception e)
        {
            Assert.Fail("qpdf is not installed (" + e.Message + "); run ./install, which installs it as CI does.");
            throw;
        }

        using (process)
        {
            var output = new MemoryStream();
            var copy = process.StandardOutput.BaseStream.CopyToAsync(output);
            var error = process.StandardError.ReadToEnd();
            process.WaitForExit();
            copy.Wait();
            Assert.True(process.ExitCode is 0 or 3, $"qpdf {string.Join(' ', arguments)} exited {process.ExitCode}: {error}");
            return output.ToArray();
        }
    }

    /// <summary>Rewrites <paramref name="input"/> with qpdf and returns the new file's bytes; "{in}" in an option names the input.</summary>
    public static byte[] Rewrite(TempFolder folder, byte[] input, params string[] options)
    {
        var source = folder.Write("qpdf-in.pdf", input);
        var target = folder.PathOf("qpdf-out.pdf");
        var arguments = new List<string> { source };
        arguments.AddRange(options.Select(o => o.Replace("{in}", source, StringComparison.Ordinal)));
        arguments.Add(target);
        Run([.. arguments]);
        return File.ReadAllBytes(target);
    }
}
