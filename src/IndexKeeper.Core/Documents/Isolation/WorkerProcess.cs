using System.ComponentModel;
using System.Diagnostics;
using Microsoft.Extensions.Logging;

namespace IndexKeeper.Core.Documents.Isolation;

/// <summary>
/// One running reader worker: the child process, its pipes and its stderr. Not thread-safe except
/// <see cref="Kill"/>, which any thread may call to end an exchange in flight.
/// </summary>
internal sealed class WorkerProcess : IDisposable
{
    private static readonly TimeSpan ExitWait = TimeSpan.FromSeconds(5);

    private readonly Process process;
    private readonly Stream requests;
    private readonly Stream replies;

    private WorkerProcess(Process process, ILogger logger)
    {
        this.process = process;
        Id = process.Id;
        requests = process.StandardInput.BaseStream;
        replies = process.StandardOutput.BaseStream;
        Stderr = new WorkerStderr(process.StandardError, Id, logger);
    }

    public int Id { get; }

    public WorkerStderr Stderr { get; }

    public bool HasExited => process.HasExited;

    /// <summary>Starts the worker and waits for its hello frame.</summary>
    /// <exception cref="InvalidOperationException">The worker could not be started or did not announce itself.</exception>
    public static WorkerProcess Start(ReaderWorkerCommand command, long? memoryLimitBytes, ReaderSettings settings, TimeSpan startTimeout, ILogger logger, CancellationToken cancellationToken)
    {
        var info = new ProcessStartInfo(command.FileName)
        {
            RedirectStandardInput = true,
            RedirectStandardOutput = true,
            RedirectStandardError = true,
            UseShellExecute = false,
            CreateNoWindow = true,
        };
        foreach (var argument in command.Arguments)
        {
            info.ArgumentList.Add(argument);
        }

        if (memoryLimitBytes is { } limit)
        {
            // The runtime reads this variable as hexadecimal; a percentage limit would override it.
            info.Environment["DOTNET_GCHeapHardLimit"] = "0x" + limit.ToString("x", System.Globalization.CultureInfo.InvariantCulture);
            info.Environment.Remove("DOTNET_GCHeapHardLimitPercent");
        }

        info.Environment[ReaderSettingsCodec.Variable] = ReaderSettingsCodec.Encode(settings);
        Process process;
        try
        {
            process = Process.Start(info) ?? throw new InvalidOperationException($"Cannot start the reader worker '{command}'.");
        }
        catch (Win32Exception e)
        {
            throw new InvalidOperationException($"Cannot start the reader worker '{command}': {e.Message}", e);
        }

        var worker = new WorkerProcess(process, logger);
        try
        {
            worker.AwaitHello(command, startTimeout, cancellationToken);
        }
        catch
        {
            worker.Dispose();
            throw;
        }

        WorkerLog.Started(logger, worker.Id, command.ToString());
        return worker;
    }

    /// <summary>Sends a request and waits for the reply; cancelling the token abandons the exchange.</summary>
    public Frame Exchange(Frame request, CancellationToken cancellationToken)
    {
        var exchange = ExchangeAsync(request, cancellationToken);

        // An abandoned exchange fails later, when the worker is killed; nobody waits for it any more.
        _ = exchange.ContinueWith(static t => t.Exception, CancellationToken.None, TaskContinuationOptions.OnlyOnFaulted, TaskScheduler.Default);
        return exchange.WaitAsync(cancellationToken).GetAwaiter().GetResult();
    }

    /// <summary>Waits briefly for the process to end after its output ended; kills it if it does not.</summary>
    /// <returns>How it ended, or null when it had to be killed.</returns>
    public string? WaitForExit()
    {
        if (!process.WaitForExit(ExitWait))
        {
            Kill();
            return null;
        }

        Stderr.WaitForEnd(ExitWait);
        return ExitStatusText.Describe(process.ExitCode);
    }

    /// <summary>Kills the worker and every process it started. Safe from any thread, any number of times.</summary>
    public void Kill()
    {
        try
        {
            process.Kill(entireProcessTree: true);
        }
        catch (Exception e) when (e is InvalidOperationException or Win32Exception or NotSupportedException)
        {
            // Already gone, or never fully started.
        }
    }

    public void Dispose()
    {
        Kill();
        process.WaitForExit(ExitWait);
        process.Dispose();
    }

    private async Task<Frame> ExchangeAsync(Frame request, CancellationToken cancellationToken)
    {
        await FrameStream.WriteAsync(requests, request, cancellationToken).ConfigureAwait(false);
        return await FrameStream.ReadAsync(replies, cancellationToken).ConfigureAwait(false)
            ?? throw new EndOfStreamException("the reader worker closed its output");
    }

    private void AwaitHello(ReaderWorkerCommand command, TimeSpan startTimeout, CancellationToken cancellationToken)
    {
        using var deadline = CancellationTokenSource.CreateLinkedTokenSource(cancellationToken);
        deadline.CancelAfter(startTimeout);
        string problem;
        try
        {
            var frame = FrameStream.ReadAsync(replies, deadline.Token).WaitAsync(deadline.Token).GetAwaiter().GetResult();
            if (frame is null)
            {
                problem = "it ended before announcing itself";
            }
            else
            {
                var version = MessageCodec.DecodeHello(frame.Value);
                if (version == ReadWorkerProtocol.Version)
                {
                    return;
                }

                problem = $"it speaks protocol version {version}, this supervisor {ReadWorkerProtocol.Version}";
            }
        }
        catch (OperationCanceledException) when (!cancellationToken.IsCancellationRequested)
        {
            problem = $"it did not announce itself within {startTimeout.TotalSeconds:0.#} s";
        }
        catch (Exception e) when (e is EndOfStreamException or IOException or ReaderProtocolException)
        {
            problem = e.Message;
        }

        var ended = process.HasExited || process.WaitForExit(TimeSpan.FromMilliseconds(500)) ? WaitForExit() : null;
        var stderr = Stderr.Excerpt();
        throw new InvalidOperationException(
            $"The reader worker '{command}' did not start: {problem}"
            + (ended is null ? string.Empty : $" ({ended})")
            + (stderr.Length == 0 ? string.Empty : $"; stderr: {stderr}"));
    }
}
