using IndexKeeper.Core.Documents;
using IndexKeeper.Core.Documents.Isolation;

namespace IndexKeeper.Tests.Isolation;

/// <summary>
/// The supervisor against stand-in workers that crash, stall or babble; after each, a good read through the
/// real worker must give exactly what the in-process reader gives.
/// </summary>
public sealed class IsolatedReaderTests : IDisposable
{
    private static readonly ReadLimits OneSecond = ReadLimits.Default with { ReadTimeout = TimeSpan.FromSeconds(1) };

    // For stand-ins that end or answer by themselves: on a loaded machine a shell can take over a second to
    // start, and a read timeout there would be reported instead of the crash under test.
    private static readonly ReadLimits Patient = ReadLimits.Default with { ReadTimeout = TimeSpan.FromSeconds(60) };

    private readonly ScratchFolder scratch = new();
    private readonly string goodPdf;

    public IsolatedReaderTests() => goodPdf = scratch.Write("inspection.pdf", GoodFiles.InspectionPdf());

    public void Dispose() => scratch.Dispose();

    [Fact]
    public void A_worker_killed_mid_read_twice_is_a_crash_with_its_signal_and_the_next_read_gets_a_new_worker()
    {
        using var reader = Create(StandInWorker.ThenReal(StandInWorker.KilledMidRead, scratch.File("starts"), 2));

        var error = NoHang.Throws<DocumentReadException>(() => reader.Read(goodPdf, Patient, CancellationToken.None));

        Assert.Equal(QuarantineReason.ReaderCrashed, error.Reason);
        Assert.Contains("exit code 137: signal 9 SIGKILL", error.Message, StringComparison.Ordinal);
        Assert.Contains("a fresh worker died on it too", error.Message, StringComparison.Ordinal);
        GoodRead.AssertWorks(reader, goodPdf);
        Assert.Equal(3, reader.WorkerStarts);
    }

    [Fact]
    public void A_worker_killed_once_does_not_blame_the_document()
    {
        using var reader = Create(StandInWorker.OnceThenReal(StandInWorker.KilledMidRead, scratch.File("starts")));

        GoodRead.AssertWorks(reader, goodPdf);

        Assert.Equal(2, reader.WorkerStarts);
    }

    [Fact]
    public void A_worker_that_exited_while_idle_is_replaced_before_the_next_read()
    {
        var reader = (IsolatedDocumentReader)Create(ReaderWorkerCommand.ForThisInstallation());
        using (reader)
        {
            GoodRead.AssertWorks(reader, goodPdf);
            using (var idle = System.Diagnostics.Process.GetProcessById(reader.WorkerProcessId!.Value))
            {
                idle.Kill();
                idle.WaitForExit();
            }

            GoodRead.AssertWorks(reader, goodPdf);
            Assert.Equal(2, reader.WorkerStarts);
        }
    }

    [Fact]
    public void A_stalled_worker_is_killed_by_the_watchdog_and_replaced()
    {
        using var reader = Create(StandInWorker.OnceThenReal(StandInWorker.Stalls, scratch.File("starts")));

        var error = NoHang.Throws<DocumentReadException>(() => reader.Read(goodPdf, OneSecond, CancellationToken.None));

        Assert.Equal(QuarantineReason.ReadTimeout, error.Reason);
        GoodRead.AssertWorks(reader, goodPdf);
        Assert.Equal(2, reader.WorkerStarts);
    }

    [Fact]
    public void The_watchdog_kills_the_whole_process_tree()
    {
        var pidFile = scratch.File("grandchild.pid");
        using var reader = Create(StandInWorker.Command($"sleep 600 & echo $! > '{pidFile}'; wait"));

        var error = NoHang.Throws<DocumentReadException>(() => reader.Read(goodPdf, OneSecond, CancellationToken.None));

        Assert.Equal(QuarantineReason.ReadTimeout, error.Reason);
        Assert.True(ProcessProbe.Ends(int.Parse(File.ReadAllText(pidFile).Trim(), System.Globalization.CultureInfo.InvariantCulture)));
    }

    [Fact]
    public void Garbage_on_the_pipe_is_a_crash_and_the_next_read_gets_a_new_worker()
    {
        using var reader = Create(StandInWorker.OnceThenReal(StandInWorker.WritesGarbage, scratch.File("starts")));

        var error = NoHang.Throws<DocumentReadException>(() => reader.Read(goodPdf, Patient, CancellationToken.None));

        Assert.Equal(QuarantineReason.ReaderCrashed, error.Reason);
        Assert.Contains("invalid reply", error.Message, StringComparison.Ordinal);
        GoodRead.AssertWorks(reader, goodPdf);
        Assert.Equal(2, reader.WorkerStarts);
    }

    [Fact]
    public void A_frame_claiming_a_huge_body_is_refused_without_reading_it()
    {
        // Magic, type Content, body length 2^31 - 1.
        using var reader = Create(StandInWorker.Command(StandInWorker.PrintBytes(Convert.FromHexString("494B525703FFFFFF7F")) + "; exec sleep 600"));

        var error = NoHang.Throws<DocumentReadException>(() => reader.Read(goodPdf, OneSecond, CancellationToken.None));

        Assert.Equal(QuarantineReason.ReaderCrashed, error.Reason);
        Assert.Contains("over the limit", error.Message, StringComparison.Ordinal);
    }

    [Fact]
    public void A_runtime_out_of_memory_abort_is_reported_as_out_of_memory()
    {
        // The runtime's last words on an unhandled out-of-memory error (wording from memory), then its abort.
        using var reader = Create(StandInWorker.Command(
            "echo 'Unhandled exception. System.OutOfMemoryException: Insufficient memory to continue the execution of the program.' >&2; kill -ABRT $$"));

        var error = NoHang.Throws<DocumentReadException>(() => reader.Read(goodPdf, Patient, CancellationToken.None));

        Assert.Equal(QuarantineReason.ReaderOutOfMemory, error.Reason);
        Assert.Contains("exit code 134: signal 6 SIGABRT", error.Message, StringComparison.Ordinal);
        Assert.Contains("Insufficient memory", error.Message, StringComparison.Ordinal);
    }

    [Fact]
    public void A_crash_message_quotes_the_first_lines_of_stderr()
    {
        using var reader = Create(StandInWorker.Command("echo 'Stack overflow.' >&2; echo '   at Frame.Draw()' >&2; kill -ABRT $$"));

        var error = NoHang.Throws<DocumentReadException>(() => reader.Read(goodPdf, Patient, CancellationToken.None));

        Assert.Equal(QuarantineReason.ReaderCrashed, error.Reason);
        Assert.Contains("Stack overflow. |    at Frame.Draw()", error.Message, StringComparison.Ordinal);
    }

    [Fact]
    public void Worker_stderr_and_restarts_go_to_the_logger()
    {
        var logger = new ListLogger();
        using var reader = IsolatedReaderFactory.Create(
            new IsolatedReaderOptions { WorkerCommand = StandInWorker.Command("echo 'xref table damaged' >&2; kill -9 $$") },
            logger);

        NoHang.Throws<DocumentReadException>(() => reader.Read(goodPdf, Patient, CancellationToken.None));

        var messages = logger.Messages;
        Assert.Contains(messages, m => m.StartsWith("Information: Reader worker ", StringComparison.Ordinal) && m.Contains(" started: /bin/sh", StringComparison.Ordinal));
        Assert.Contains(messages, m => m.StartsWith("Warning: Reader worker ", StringComparison.Ordinal) && m.EndsWith(" stderr: xref table damaged", StringComparison.Ordinal));
        Assert.Contains(messages, m => m.Contains("trying once more with a fresh worker", StringComparison.Ordinal));
        Assert.Equal(2, messages.Count(m => m.Contains(" stopped: the reader process died reading this document", StringComparison.Ordinal)));
    }

    [Fact]
    public void The_memory_cap_reaches_the_worker_environment_in_hexadecimal()
    {
        using var capped = Create(StandInWorker.Command("echo \"cap=${DOTNET_GCHeapHardLimit:-none}\" >&2; kill -9 $$"), 1L << 30);
        using var uncapped = Create(StandInWorker.Command("echo \"cap=${DOTNET_GCHeapHardLimit:-none}\" >&2; kill -9 $$"), null);

        var cappedError = NoHang.Throws<DocumentReadException>(() => capped.Read(goodPdf, Patient, CancellationToken.None));
        var uncappedError = NoHang.Throws<DocumentReadException>(() => uncapped.Read(goodPdf, Patient, CancellationToken.None));

        Assert.Contains("cap=0x40000000", cappedError.Message, StringComparison.Ordinal);
        Assert.Contains("cap=none", uncappedError.Message, StringComparison.Ordinal);
    }

    [Fact]
    public void A_canned_content_reply_is_returned_as_sent()
    {
        var content = MessageCodecTests.SampleContent();
        using var reader = Create(StandInWorker.Command(StandInWorker.PrintBytes(FrameStream.Encode(MessageCodec.Content(content))) + "; exec sleep 600"));

        var read = NoHang.Run(() => reader.Read(goodPdf, OneSecond, CancellationToken.None));

        Assert.Equal(ReadOutcome.Describe(content), ReadOutcome.Describe(read));
    }

    [Fact]
    public void A_fault_is_a_crash_of_the_reader_and_the_worker_is_replaced()
    {
        var fault = FrameStream.Encode(MessageCodec.Fault(new InvalidDataException("broken object stream")));
        using var reader = Create(StandInWorker.OnceThenReal(StandInWorker.PrintBytes(fault) + "; exec sleep 600", scratch.File("starts")));

        var error = NoHang.Throws<DocumentReadException>(() => reader.Read(goodPdf, Patient, CancellationToken.None));

        Assert.Equal(QuarantineReason.ReaderCrashed, error.Reason);
        Assert.Contains("System.IO.InvalidDataException: broken object stream", error.Message, StringComparison.Ordinal);
        GoodRead.AssertWorks(reader, goodPdf);
        Assert.Equal(2, reader.WorkerStarts);
    }

    [Fact]
    public void An_out_of_memory_refusal_replaces_the_worker()
    {
        var refusal = FrameStream.Encode(MessageCodec.Refusal(QuarantineReason.ReaderOutOfMemory, "the reader ran out of memory"));
        using var reader = Create(StandInWorker.OnceThenReal(StandInWorker.PrintBytes(refusal) + "; exec sleep 600", scratch.File("starts")));

        var error = NoHang.Throws<DocumentReadException>(() => reader.Read(goodPdf, Patient, CancellationToken.None));

        Assert.Equal(QuarantineReason.ReaderOutOfMemory, error.Reason);
        GoodRead.AssertWorks(reader, goodPdf);
        Assert.Equal(2, reader.WorkerStarts);
    }

    [Fact]
    public void Cancelling_kills_the_read_in_flight_and_the_next_read_works()
    {
        using var reader = Create(StandInWorker.OnceThenReal(StandInWorker.Stalls, scratch.File("starts")));
        using var cancel = new CancellationTokenSource(TimeSpan.FromMilliseconds(300));

        NoHang.Throws<OperationCanceledException>(() => reader.Read(goodPdf, ReadLimits.Default, cancel.Token));

        GoodRead.AssertWorks(reader, goodPdf);
        Assert.Equal(2, reader.WorkerStarts);
    }

    [Fact]
    public void Disposing_during_a_read_kills_the_worker_and_does_not_blame_the_document()
    {
        var reader = (IsolatedDocumentReader)Create(StandInWorker.Command(StandInWorker.Stalls));
        var read = Task.Run(() => reader.Read(goodPdf, ReadLimits.Default, CancellationToken.None));
        var processId = NoHang.Run(() =>
        {
            while (reader.WorkerProcessId is null)
            {
                Thread.Sleep(20);
            }

            return reader.WorkerProcessId.Value;
        });

        reader.Dispose();

        var error = NoHang.Throws<AggregateException>(() => read.Wait());
        Assert.IsType<ObjectDisposedException>(error.InnerException);
        Assert.True(ProcessProbe.Ends(processId));
        Assert.Throws<ObjectDisposedException>(() => reader.Read(goodPdf, ReadLimits.Default, CancellationToken.None));
    }

    [Fact]
    public void A_worker_that_cannot_start_is_a_setup_fault_not_a_quarantine()
    {
        using var exits = Create(new ReaderWorkerCommand("/bin/sh", ["-c", "echo 'no runtime here' >&2; exit 3"]));
        using var missing = Create(new ReaderWorkerCommand(scratch.File("no-such-worker"), []));
        using var wrongVersion = Create(new ReaderWorkerCommand("/bin/sh", ["-c", StandInWorker.PrintBytes(Convert.FromHexString("494B52570102000000" + "0300")) + "; exec sleep 600"]));

        var exitError = NoHang.Throws<InvalidOperationException>(() => exits.Read(goodPdf, OneSecond, CancellationToken.None));
        var missingError = NoHang.Throws<InvalidOperationException>(() => missing.Read(goodPdf, OneSecond, CancellationToken.None));
        var versionError = NoHang.Throws<InvalidOperationException>(() => wrongVersion.Read(goodPdf, OneSecond, CancellationToken.None));

        Assert.Contains("exit code 3", exitError.Message, StringComparison.Ordinal);
        Assert.Contains("no runtime here", exitError.Message, StringComparison.Ordinal);
        Assert.Contains("no-such-worker", missingError.Message, StringComparison.Ordinal);
        Assert.Contains("protocol version 3", versionError.Message, StringComparison.Ordinal);
        Assert.Equal(0, exits.WorkerStarts);
    }

    [Fact]
    public void A_worker_that_never_announces_itself_is_given_up_after_the_start_timeout()
    {
        using var reader = IsolatedReaderFactory.Create(new IsolatedReaderOptions
        {
            WorkerCommand = new ReaderWorkerCommand("/bin/sh", ["-c", "exec sleep 600"]),
            StartTimeout = TimeSpan.FromSeconds(1),
        });

        var error = NoHang.Throws<InvalidOperationException>(() => reader.Read(goodPdf, OneSecond, CancellationToken.None));

        Assert.Contains("did not announce itself", error.Message, StringComparison.Ordinal);
    }

    [Fact]
    public void Options_reject_bad_values_at_once()
    {
        var options = new IsolatedReaderOptions();

        Assert.Throws<ArgumentOutOfRangeException>(() => options.WorkerMemoryLimitBytes = 1024 * 1024);
        Assert.Throws<ArgumentOutOfRangeException>(() => options.StartTimeout = TimeSpan.Zero);
        Assert.Throws<ArgumentOutOfRangeException>(() => options.KillGrace = TimeSpan.FromSeconds(-1));
        Assert.Equal(2L * 1024 * 1024 * 1024, options.WorkerMemoryLimitBytes);
        options.WorkerMemoryLimitBytes = null;
        Assert.Null(options.WorkerMemoryLimitBytes);
    }

    [Fact]
    public void A_read_timeout_that_is_not_positive_is_refused()
    {
        using var reader = Create(StandInWorker.Command(StandInWorker.Stalls));

        Assert.Throws<ArgumentOutOfRangeException>(() => reader.Read(goodPdf, ReadLimits.Default with { ReadTimeout = TimeSpan.Zero }, CancellationToken.None));
        Assert.Equal(0, reader.WorkerStarts);
    }

    private static IIsolatedDocumentReader Create(ReaderWorkerCommand command, long? memoryLimitBytes = 2L * 1024 * 1024 * 1024) =>
        IsolatedReaderFactory.Create(new IsolatedReaderOptions
        {
            WorkerCommand = command,
            WorkerMemoryLimitBytes = memoryLimitBytes,
            KillGrace = TimeSpan.Zero,
        });
}
