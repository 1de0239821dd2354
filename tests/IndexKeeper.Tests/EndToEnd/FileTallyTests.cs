using System.Text.Json;

namespace IndexKeeper.Tests.EndToEnd;

/// <summary>
/// Nothing is skipped silently: <c>scan --json</c> and <c>status --json</c> count what a root holds by type,
/// through the real executable. The default selection takes readable types in any letter case.
/// </summary>
public sealed class FileTallyTests : IDisposable
{
    private readonly CliIndex index = new("share");

    [Fact]
    public void Scan_and_status_count_indexed_kinds_and_the_unsupported_types_they_passed_over()
    {
        index.Put("share/minutes/2026-03 board minutes.pdf", StorePdfs.Document("minutes", 2));
        index.Put("share/scans/SCAN0001.PDF", StorePdfs.Document("delivery note", 1));
        index.Put("share/notes/handover.txt", "Pump house 3: the standby pump is on manual until Friday."u8.ToArray());
        index.Put("share/cad/valve-chamber.dwg", [0x41, 0x43, 0x31, 0x30, 0x33, 0x32]);
        index.Put("share/cad/pipework.dwg", [0x41, 0x43, 0x31, 0x30, 0x33, 0x32, 0x00]);
        index.Put("share/exports/readings.zip", [0x50, 0x4B, 0x05, 0x06, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0]);
        index.Put("share/README", "no extension"u8.ToArray());

        var scan = index.Json("scan");
        ContractAssert.Counts(scan, "first scan", ("documentsSeen", 3), ("documentsQuarantined", 0), ("filesSkippedByPattern", 0), ("filesUnsupported", 4));
        Assert.Equal(
            [("(none)", 1), (".dwg", 2), (".zip", 1)],
            scan.GetProperty("unsupportedTypes").EnumerateObject().Select(p => (p.Name, p.Value.GetInt64())).ToList());

        var files = index.Json("status").GetProperty("files");
        Assert.Equal(
            [("Pdf", 2), ("PlainText", 1)],
            files.GetProperty("indexedByKind").EnumerateObject().Select(p => (p.Name, p.Value.GetInt64())).ToList());
        Assert.Equal(0, files.GetProperty("quarantined").GetInt64());
        Assert.Equal(4, files.GetProperty("unsupported").GetInt64());
        Assert.Equal(
            [(".dwg", 2), ("(none)", 1), (".zip", 1)],
            files.GetProperty("unsupportedTypes").EnumerateArray().Select(t => (t.GetProperty("type").GetString(), t.GetProperty("files").GetInt64())).ToList());
    }

    public void Dispose() => index.Dispose();
}
