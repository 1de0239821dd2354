using System.Diagnostics;

namespace IndexKeeper.Core.Documents.Tools;

/// <summary>
/// Runs an external program on an untrusted document (LibreOffice, Tesseract, pdftoppm): no shell, a time
/// limit, an optional address-space cap, the whole process tree killed on timeout or cancellation.
/// </summary>
internal static class ToolRunner
{
    private const int MaxErrorChars = 4096;

    /// <summary>Runs <paramref name="program"/> to its end.</summary>
    /// <exception cref="TimeoutException">It ran longer than <paramref name="timeout"/> and was killed.</exception>
    /// <exception cref="OperationCanceledException">The caller cancelled; it was killed.</exception>
    public static ToolRun Run(
        string program,
        IEnumerable<string> arguments,
        TimeSpan timeout,
        long? memoryBytes,
        long maxOutputBytes,
        CancellationToken cancellationToken,
        IReadOnlyDictionary<string, string>? environment = null)
    {
        var start = StartInfo(program, arguments, memoryBytes);
        foreach (var (name, value) in environment ?? new Dictionary<string, string>())
        {
            start.Environment[name] = value;
        }

        using var process = Process.Start(start) ?? throw new InvalidOperationException($"'{program}' does not start.");
        process.StandardInput.Close();
        using var limit = CancellationTokenSource.CreateLinkedTokenSource(cancellationToken);
        limit.CancelAfter(timeout);
        using var kill = limit.Token.Register(() => Kill(process));
        var error = ReadErrorAsync(process);
        var output = new MemoryStream();
        var buffer = new byte[1 << 16];
        var stdout = process.StandardOutput.BaseStream;
        int read;
        while ((read = stdout.Read(buffer)) > 0)
        {
            if (output.Length + read > maxOutputBytes)
            {
                Kill(process);
                process.WaitForExit();
                throw new InvalidOperationException($"'{Path.GetFileName(program)}' wrote more than {maxOutputBytes} bytes.");
            }

            output.Write(buffer, 0, read);
        }

        process.WaitForExit();
        cancellationToken.ThrowIfCancellationRequested();
        if (limit.IsCancellationRequested)
        {
            throw new TimeoutException($"'{Path.GetFileName(program)}' took longer than {timeout.TotalSeconds:0.#} s and was stopped.");
        }

        return new ToolRun(process.ExitCode, output.ToArray(), error.GetAwaiter().GetResult());
    }

    private static ProcessStartInfo StartInfo(string program, IEnumerable<string> arguments, long? memoryBytes)
    {
        // prlimit (util-linux) sets RLIMIT_AS on the program it then executes: the kernel refuses its
        // allocations past the cap, which the program reports as a failure. Elsewhere no cap is set.
        var prlimit = memoryBytes is not null && OperatingSystem.IsLinux() ? ExecutableLocator.Find("prlimit") : null;
        var start = new ProcessStartInfo(prlimit ?? program)
        {
            RedirectStandardInput = true,
            RedirectStandardOutput = true,
            RedirectStandardError = true,
            UseShellExecute = false,
        };
        if (prlimit is not null)
        {
            start.ArgumentList.Add("--as=" + memoryBytes!.Value.ToString(System.Globalization.CultureInfo.InvariantCulture));
            start.ArgumentList.Add("--");
            start.ArgumentList.Add(program);
        }

        foreach (var argument in arguments)
        {
            start.ArgumentList.Add(argument);
        }

        return start;
    }

    private static async Task<string> ReadErrorAsync(Process process)
    {
        var text = await process.StandardError.ReadToEndAsync().ConfigureAwait(false);
        return text.Length > MaxErrorChars ? text[..MaxErrorChars] : text;
    }

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
