using IndexKeeper.Core.Documents;
using IndexKeeper.Core.Documents.Isolation;

namespace IndexKeeper.Tests.Isolation;

/// <summary>
/// Hostile files through the real worker: each ends in a refusal with a reason (never a hang, never a
/// crash of this process), and a good file read right after it gives what the in-process reader gives.
/// </summary>
public sealed class HostileFileTests : IDisposable
{
    // Low caps, so the bomb and the memory limit bite quickly.
    private static readonly ReadLimits Limits = ReadLimits.Default with
    {
        MaxDecodedBytesPerStream = 16L * 1024 * 1024,
        ReadTimeout = TimeSpan.FromSeconds(30),
    };

    private readonly ScratchFolder scratch = new();
    private readonly string goodPdf;

    public HostileFileTests() => goodPdf = scratch.Write("inspection.pdf", GoodFiles.InspectionPdf());

    /// <summary>
    /// The reason each file must be quarantined under: the form cycle is found before it is followed, the
    /// bomb stops at the cap, the nesting at the parser's depth limit; neither random bytes nor an empty
    /// file carry a known signature.
    /// </summary>
    public static TheoryData<string, QuarantineReason> ExpectedReasons => new()
    {
        { HostileFiles.CyclicForms, QuarantineReason.Corrupt },
        { HostileFiles.InflationBomb, QuarantineReason.DecodedStreamTooLarge },
        { HostileFiles.NestedArrays, QuarantineReason.Corrupt },
        { HostileFiles.RandomBytes, QuarantineReason.Unsupported },
        { HostileFiles.Encrypted, QuarantineReason.Encrypted },
        { HostileFiles.ZeroBytes, QuarantineReason.Unsupported },
    };

    /// <summary>Files the in-process reader may be given: everything but the one that overflows its stack.</summary>
    public static TheoryData<string> SafeInProcess => [.. HostileFiles.All.Where(name => name != HostileFiles.CyclicForms)];

    public void Dispose() => scratch.Dispose();

    [Theory]
    [MemberData(nameof(ExpectedReasons))]
    public void A_hostile_file_is_refused_with_its_reason_and_the_next_good_read_works(string name, QuarantineReason expected)
    {
        var path = HostileFiles.Write(name, scratch);
        using var reader = CreateReader();

        var error = NoHang.Throws<DocumentReadException>(() => reader.Read(path, Limits, CancellationToken.None));

        Assert.True(expected == error.Reason, $"{name}: expected {expected}, got {error.Reason}: {error.Message}");
        Assert.False(string.IsNullOrWhiteSpace(error.Message));
        GoodRead.AssertWorks(reader, goodPdf);
    }

    [Fact]
    public void A_document_that_exhausts_the_worker_heap_is_out_of_memory_and_the_worker_is_replaced()
    {
        // Without the per-stream cap the bomb's 200 MB must be held by a worker capped at 128 MiB of heap.
        var path = HostileFiles.Write(HostileFiles.InflationBomb, scratch);
        using var reader = IsolatedReaderFactory.Create(new IsolatedReaderOptions { WorkerMemoryLimitBytes = 128L * 1024 * 1024 });

        var error = NoHang.Throws<DocumentReadException>(() =>
            reader.Read(path, Limits with { MaxDecodedBytesPerStream = long.MaxValue }, CancellationToken.None));

        Assert.Equal(QuarantineReason.ReaderOutOfMemory, error.Reason);
        GoodRead.AssertWorks(reader, goodPdf);
        Assert.Equal(2, reader.WorkerStarts);
    }

    [Theory]
    [MemberData(nameof(SafeInProcess))]
    public void The_isolated_reader_refuses_as_the_in_process_reader_does(string name)
    {
        var path = HostileFiles.Write(name, scratch);
        using var reader = CreateReader();

        var inProcess = ReadOutcome.Of(() => DocumentReaderFactory.Create().Read(path, Limits, CancellationToken.None));
        var isolated = NoHang.Run(() => ReadOutcome.Of(() => reader.Read(path, Limits, CancellationToken.None)));

        Assert.StartsWith("refused ", inProcess, StringComparison.Ordinal);
        Assert.Equal(inProcess, isolated);
    }

    [Fact]
    public void One_reader_survives_every_hostile_file_in_turn()
    {
        using var reader = CreateReader();
        foreach (var name in HostileFiles.All)
        {
            var path = HostileFiles.Write(name, scratch);
            NoHang.Throws<DocumentReadException>(() => reader.Read(path, Limits, CancellationToken.None));
            GoodRead.AssertWorks(reader, goodPdf);
        }
    }

    [Fact]
    public void The_worker_is_kept_alive_across_documents()
    {
        using var reader = CreateReader();

        for (var i = 0; i < 3; i++)
        {
            GoodRead.AssertWorks(reader, goodPdf);
        }

        Assert.Equal(1, reader.WorkerStarts);
    }

    [Fact]
    public void Disposing_the_reader_ends_its_worker()
    {
        var reader = (IsolatedDocumentReader)CreateReader();
        GoodRead.AssertWorks(reader, goodPdf);
        var processId = reader.WorkerProcessId;

        reader.Dispose();

        Assert.NotNull(processId);
        Assert.True(ProcessProbe.Ends(processId.Value));
    }

    [Fact]
    public void The_default_worker_is_this_installation_s_executable()
    {
        var command = ReaderWorkerCommand.ForThisInstallation();

        Assert.Equal(Path.Combine(AppContext.BaseDirectory, "indexkeeper"), command.FileName);
        Assert.Equal([ReaderWorkerCommand.Verb], command.Arguments);
    }

    private static IIsolatedDocumentReader CreateReader() =>
        IsolatedReaderFactory.Create(new IsolatedReaderOptions { WorkerMemoryLimitBytes = 256L * 1024 * 1024 });
}
