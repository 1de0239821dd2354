using IndexKeeper.Core.Catalog;
using IndexKeeper.Core.Compaction;
using IndexKeeper.Core.Documents;
using IndexKeeper.Core.Faults;
using IndexKeeper.Core.Storage;
using IndexKeeper.Core.Telemetry;

namespace IndexKeeper.Core.Index;

/// <summary>
/// Compaction of page-word files (docs/compaction.md, "Page-word files"): the catalog says which records
/// are live, <see cref="WordFilePolicy"/> picks the files, and each is rewritten in the order of a segment
/// swap: new file written and fsynced, one catalog commit moves the pages' words to it, then the old file is
/// deleted, and only while no other process reads the index. A file whose delete is put off names nothing
/// any more, so the next run deletes it.
/// REQUIRES: the index lock is held; the caller is the one writer.
/// </summary>
public static class WordCompaction
{
    /// <summary>The files the policy would compact now, with their figures; reads only (one pass over the page records).</summary>
    public static IReadOnlyList<WordFileStats> Due(IndexCatalog catalog, PageWordStore words, CompactionOptions options)
    {
        ArgumentNullException.ThrowIfNull(catalog);
        ArgumentNullException.ThrowIfNull(words);
        var live = catalog.Pages.WordLocations()
            .GroupBy(p => p.At.File)
            .ToDictionary(g => g.Key, g => (Bytes: g.Sum(p => (long)p.At.Length), Records: g.Count()));
        var stats = words.Files()
            .Select(f => live.TryGetValue(f.Id, out var l) ? new WordFileStats(f.Id, f.Bytes, l.Bytes, l.Records) : new WordFileStats(f.Id, f.Bytes, 0, 0))
            .ToList();
        return WordFilePolicy.Plan(stats, options, words.OpenFileId);
    }

    public static WordCompactionReport Run(IndexCatalog catalog, PageWordStore words, string indexDirectory, CompactionOptions options, CancellationToken cancellationToken)
    {
        var due = Due(catalog, words, options);
        if (due.Count == 0)
        {
            return WordCompactionReport.None;
        }

        using var activity = CoreTelemetry.Traces.StartActivity("compaction.words");
        activity?.SetTag("indexkeeper.files", due.Count);
        int rewritten = 0, deleted = 0;
        long read = 0, written = 0, reclaimed = 0;
        var damaged = new List<string>();
        var retired = new List<WordFileStats>();
        foreach (var file in due)
        {
            cancellationToken.ThrowIfCancellationRequested();
            if (file.LiveRecords > 0)
            {
                var live = catalog.Pages.WordLocations()
                    .Where(p => p.At.File == file.FileId)
                    .Select(p => (PageKey.Parse(p.Key), new PageWordsLocation(p.At.File, p.At.Offset, p.At.Length, unchecked((uint)p.At.Checksum))))
                    .ToList();
                PageWordsRewrite result;
                try
                {
                    result = words.Rewrite(file.FileId, live);
                }
                catch (InvalidDataException ex)
                {
                    // The file keeps its words where the catalog says; verify names each failing page.
                    damaged.Add($"page-word file {file.FileId} left as it is: {ex.Message}");
                    continue;
                }

                FaultInjection.Reach(FaultPoints.WordsCompactionBeforeCommit);
                catalog.MovePageWords(file.FileId, result.Moves.ToDictionary(
                    m => m.Key.Hex,
                    m => new WordsAtRecord { File = m.Value.File, Offset = m.Value.Offset, Length = m.Value.Length, Checksum = m.Value.Checksum }));
                FaultInjection.Reach(FaultPoints.WordsCompactionAfterCommit);
                rewritten++;
                read += result.BytesRead;
                written += result.BytesWritten;
            }

            retired.Add(file);
        }

        // Readers of other processes may hold a catalog that still names the old files: delete only while none reads.
        using (var readersOut = ReaderGate.TryEnterExclusive(indexDirectory))
        {
            if (readersOut is not null)
            {
                foreach (var file in retired)
                {
                    words.Delete(file.FileId);
                    deleted += file.LiveRecords == 0 ? 1 : 0;
                    reclaimed += file.FileBytes;
                }
            }
        }

        reclaimed -= written;
        CoreTelemetry.CompactionWordBytes.Add(read, new KeyValuePair<string, object?>("kind", "read"));
        CoreTelemetry.CompactionWordBytes.Add(written, new KeyValuePair<string, object?>("kind", "written"));
        CoreTelemetry.CompactionWordBytes.Add(Math.Max(0, reclaimed), new KeyValuePair<string, object?>("kind", "reclaimed"));
        return new WordCompactionReport(rewritten, deleted, read, written, Math.Max(0, reclaimed), damaged);
    }
}
