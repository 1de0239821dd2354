namespace IndexKeeper.Core.Documents.Isolation;

/// <summary>
/// The reader worker: a child process that reads one document per request with an in-process
/// <see cref="IDocumentReader"/> and answers over its stdout (protocol in docs/reader-worker.md), so that a
/// document that hangs, exhausts memory or overflows the stack of the parser takes down only this process.
/// </summary>
public static class ReadWorkerHost
{
    /// <summary>Exit code when the supervisor closed the input: the normal end.</summary>
    public const int ExitInputClosed = 0;

    /// <summary>Exit code when the supervisor sent something that is not a request (same as bad usage).</summary>
    public const int ExitProtocolError = 2;

    /// <summary>
    /// Serves read requests from <paramref name="input"/> until it ends. Closing the input ends the worker at
    /// once, also in the middle of a read, so a worker whose supervisor died does not keep on parsing.
    /// </summary>
    public static int Run(Stream input, Stream output, IDocumentReader reader, CancellationToken cancellationToken)
    {
        ArgumentNullException.ThrowIfNull(input);
        ArgumentNullException.ThrowIfNull(output);
        ArgumentNullException.ThrowIfNull(reader);
        return RunAsync(input, output, reader, cancellationToken).GetAwaiter().GetResult();
    }

    /// <summary>Entry point of the hidden <c>read-worker</c> command: serves over stdin and stdout.</summary>
    public static int RunOverStandardStreams()
    {
        using var input = Console.OpenStandardInput();
        using var output = Console.OpenStandardOutput();

        // Anything a library prints must not land among the frames.
        Console.SetOut(Console.Error);
        ReaderSettings settings;
        try
        {
            settings = ReaderSettingsCodec.FromEnvironment();
        }
        catch (ReaderProtocolException e)
        {
            Console.Error.WriteLine($"read-worker: {e.Message}");
            return ExitProtocolError;
        }

        return Run(input, output, DocumentReaderFactory.Create(settings), CancellationToken.None);
    }

    private static async Task<int> RunAsync(Stream input, Stream output, IDocumentReader reader, CancellationToken cancellationToken)
    {
        await FrameStream.WriteAsync(output, MessageCodec.Hello(), cancellationToken).ConfigureAwait(false);
        var next = FrameStream.ReadFirstByteAsync(input, cancellationToken);
        while (true)
        {
            var first = await next.ConfigureAwait(false);
            if (first < 0)
            {
                return ExitInputClosed;
            }

            string path;
            ReadLimits limits;
            try
            {
                (path, limits) = MessageCodec.DecodeRequest(
                    await FrameStream.ReadRestAsync(input, (byte)first, cancellationToken).ConfigureAwait(false));
            }
            catch (EndOfStreamException)
            {
                return ExitInputClosed;
            }
            catch (ReaderProtocolException e)
            {
                await Console.Error.WriteLineAsync($"read-worker: {e.Message}").ConfigureAwait(false);
                return ExitProtocolError;
            }

            // Watch the input while the document is read: its end means the supervisor is gone.
            next = FrameStream.ReadFirstByteAsync(input, cancellationToken);
            var answer = Task.Run(() => Answer(reader, path, limits, cancellationToken), cancellationToken);
            if (await Task.WhenAny(answer, next).ConfigureAwait(false) == next && await next.ConfigureAwait(false) < 0)
            {
                return ExitInputClosed;
            }

            await FrameStream.WriteAsync(output, await answer.ConfigureAwait(false), cancellationToken).ConfigureAwait(false);
        }
    }

    private static Frame Answer(IDocumentReader reader, string path, ReadLimits limits, CancellationToken cancellationToken)
    {
        // A reader that honours its token stops at the deadline itself, which spares a restart; the
        // supervisor's watchdog stops one that does not.
        using var deadline = CancellationTokenSource.CreateLinkedTokenSource(cancellationToken);
        if (limits.ReadTimeout > TimeSpan.Zero && limits.ReadTimeout < TimeSpan.FromDays(1))
        {
            deadline.CancelAfter(limits.ReadTimeout);
        }

        try
        {
            return MessageCodec.Content(reader.Read(path, limits, deadline.Token));
        }
        catch (DocumentReadException e)
        {
            return MessageCodec.Refusal(e.Reason, e.Message);
        }
        catch (OperationCanceledException) when (deadline.IsCancellationRequested && !cancellationToken.IsCancellationRequested)
        {
            return MessageCodec.Refusal(QuarantineReason.ReadTimeout, $"reading took longer than {limits.ReadTimeout}");
        }
        catch (OutOfMemoryException e)
        {
            return MessageCodec.Refusal(QuarantineReason.ReaderOutOfMemory, $"the reader ran out of memory: {e.Message}");
        }
        catch (Exception e) when (e is not OperationCanceledException)
        {
            Console.Error.WriteLine($"read-worker: reader failed on {path}: {e}");
            return MessageCodec.Fault(e);
        }
    }
}
