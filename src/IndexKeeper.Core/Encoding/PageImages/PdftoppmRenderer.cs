using System.Diagnostics;
using IndexKeeper.Core.Documents.Tools;

namespace IndexKeeper.Core.Encoding.PageImages;

/// <summary>
/// Renders with poppler's <c>pdftoppm</c>: one process per run of pages, writing binary PPM images back to back
/// on its standard output (PPM, not PNG: compressing each page would cost many times the drawing). The
/// process reads an untrusted document, so it runs under a time limit and is killed when it passes it.
/// </summary>
internal sealed class PdftoppmRenderer : IPdfRenderer
{
    private readonly string program;
    private readonly TimeSpan timeout;

    private PdftoppmRenderer(string program, string version, TimeSpan timeout)
    {
        this.program = program;
        this.timeout = timeout;
        Version = version;
    }

    public string Version { get; }

    /// <summary>Finds the program and asks its version (<c>pdftoppm -v</c>).</summary>
    /// <exception cref="InvalidOperationException">The program is missing or does not answer as pdftoppm.</exception>
    public static PdftoppmRenderer Create(string program, TimeSpan timeout)
    {
        var path = ExecutableLocator.Find(program)
            ?? throw new InvalidOperationException($"pdftoppm: '{program}' is not found; install poppler-utils or give its path.");
        var start = new ProcessStartInfo(path) { RedirectStandardError = true, RedirectStandardOutput = true, UseShellExecute = false };
        start.ArgumentList.Add("-v");
        using var process = Process.Start(start) ?? throw new InvalidOperationException($"pdftoppm: '{path}' does not start.");
        var output = process.StandardOutput.ReadToEndAsync();
        var error = process.StandardError.ReadToEnd();
        if (!process.WaitForExit(TimeSpan.FromSeconds(30)))
        {
            process.Kill();
            throw new InvalidOperationException($"pdftoppm: '{path} -v' does not finish.");
        }

        // Poppler prints "pdftoppm version X.Y.Z" on standard error.
        var line = (error + output.Result).Split('\n', StringSplitOptions.TrimEntries | StringSplitOptions.RemoveEmptyEntries)
            .FirstOrDefault(l => l.StartsWith("pdftoppm version ", StringComparison.Ordinal));
        return line is null
            ? throw new InvalidOperationException($"pdftoppm: '{path} -v' does not report a pdftoppm version.")
            : new PdftoppmRenderer(path, line, timeout);
    }

    public void Render(string path, int firstPage, int lastPage, int dpi, Action<int, RasterImage> onPage, CancellationToken cancellationToken)
    {
        ArgumentNullException.ThrowIfNull(onPage);
        var start = new ProcessStartInfo(program) { RedirectStandardOutput = true, RedirectStandardError = true, UseShellExecute = false };
        foreach (var argument in new[] { "-r", dpi.ToString(System.Globalization.CultureInfo.InvariantCulture), "-f", Number(firstPage), "-l", Number(lastPage), "-cropbox" })
        {
            start.ArgumentList.Add(argument);
        }

        // A full path never starts with '-', so it cannot be taken for an option.
        start.ArgumentList.Add(Path.GetFullPath(path));
        using var process = Process.Start(start) ?? throw new InvalidOperationException($"pdftoppm does not start for '{path}'.");
        using var limit = CancellationTokenSource.CreateLinkedTokenSource(cancellationToken);
        limit.CancelAfter(timeout);
        using var kill = limit.Token.Register(() => Kill(process));
        var error = process.StandardError.ReadToEndAsync(CancellationToken.None);
        var page = firstPage;
        var finished = false;
        try
        {
            using var output = new BufferedStream(process.StandardOutput.BaseStream, 1 << 16);
            while (NetpbmReader.Read(output) is { } raster)
            {
                if (page > lastPage)
                {
                    throw new InvalidOperationException($"pdftoppm drew more pages than asked of '{path}'.");
                }

                onPage(page++, raster);
            }

            finished = true;
        }
        catch (Exception e) when (e is InvalidDataException or IOException)
        {
            cancellationToken.ThrowIfCancellationRequested();
            throw new InvalidOperationException(
                limit.IsCancellationRequested
                    ? $"pdftoppm took longer than {timeout.TotalSeconds:0} s on '{path}' and was stopped."
                    : $"pdftoppm wrote output for '{path}' that is not a PPM image: {e.Message}",
                e);
        }
        finally
        {
            if (!finished)
            {
                // Nobody reads its output any more: stop it rather than leave it blocked on a full pipe.
                Kill(process);
            }
        }

        process.WaitForExit();
        cancellationToken.ThrowIfCancellationRequested();
        if (limit.IsCancellationRequested)
        {
            throw new InvalidOperationException($"pdftoppm took longer than {timeout.TotalSeconds:0} s on '{path}' and was stopped.");
        }

        if (process.ExitCode != 0 || page != lastPage + 1)
        {
            var message = error.Result.Trim();
            throw new InvalidOperationException(
                $"pdftoppm could not draw pages {firstPage}-{lastPage} of '{path}' (exit code {process.ExitCode}, {page - firstPage} page(s) drawn){(message.Length > 0 ? ": " + message : ".")}");
        }
    }

    private static string Number(int value) => value.ToString(System.Globalization.CultureInfo.InvariantCulture);

    private static void Kill(Process process)
    {
        try
        {
            process.Kill(entireProcessTree: true);
        }
        catch (InvalidOperationException)
        {
            // It has already exited.
        }
    }
}
