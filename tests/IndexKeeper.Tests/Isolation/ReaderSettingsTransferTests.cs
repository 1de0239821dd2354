using System.Diagnostics;
using IndexKeeper.Core.Documents;
using IndexKeeper.Core.Documents.Isolation;
using IndexKeeper.Tests.Readers;

namespace IndexKeeper.Tests.Isolation;

/// <summary>The reader settings reach the real worker process, and a worker refuses settings of another version (docs/reader-worker.md, "Settings").</summary>
public sealed class ReaderSettingsTransferTests : IDisposable
{
    private readonly ScratchFolder scratch = new();

    public void Dispose() => scratch.Dispose();

    [Fact]
    public void The_worker_reads_with_the_settings_it_was_given()
    {
        // The default converter would convert the letter; only a worker that got these settings looks here.
        var converter = scratch.File("no-such-soffice");
        using var reader = IsolatedReaderFactory.Create(new IsolatedReaderOptions { ReaderSettings = ReaderSettings.Default with { OfficeConverter = converter } });
        var letter = scratch.Write("letter.docx", OfficeSamples.Letter("R. Pennock", new DateTime(2024, 3, 1, 9, 15, 0, DateTimeKind.Utc)));

        var failure = NoHang.Throws<DocumentReadException>(() => reader.Read(letter, ReadLimits.Default, CancellationToken.None));

        Assert.Equal(QuarantineReason.ToolMissing, failure.Reason);
        Assert.Contains(converter, failure.Message, StringComparison.Ordinal);
    }

    [Theory]
    [InlineData("{\"version\":2,\"settings\":{}}", "version 2")]
    [InlineData("not json", "not valid settings JSON")]
    public async Task A_worker_refuses_settings_it_cannot_read_before_it_says_hello(string variable, string reason)
    {
        var command = ReaderWorkerCommand.ForThisInstallation();
        var start = new ProcessStartInfo(command.FileName) { RedirectStandardOutput = true, RedirectStandardError = true, RedirectStandardInput = true, UseShellExecute = false };
        foreach (var argument in command.Arguments)
        {
            start.ArgumentList.Add(argument);
        }

        start.Environment[ReaderSettingsCodec.Variable] = variable;
        using var worker = Process.Start(start)!;
        var error = worker.StandardError.ReadToEndAsync();
        var output = await worker.StandardOutput.ReadToEndAsync();
        using var bound = new CancellationTokenSource(TimeSpan.FromMinutes(1));
        await worker.WaitForExitAsync(bound.Token);

        Assert.Equal(ReadWorkerHost.ExitProtocolError, worker.ExitCode);
        Assert.Empty(output);
        Assert.Contains(reason, await error, StringComparison.Ordinal);
    }
}
