using System.Globalization;
using IndexKeeper.Core.Pipeline;

namespace IndexKeeper.Cli.Output;

/// <summary>The human-readable change summary of a scan or sync.</summary>
internal static class SummaryText
{
    public static void Write(TextWriter output, ScanSummary s)
    {
        var c = CultureInfo.InvariantCulture;
        output.WriteLine(string.Create(c, $"Scanned {s.DocumentsSeen} documents in {s.ElapsedSeconds:0.0} s ({s.FilesHashed} hashed, {s.DocumentsRead} read)."));
        output.WriteLine(string.Create(c, $"  documents  new {s.DocumentsNew}, changed {s.DocumentsChanged}, unchanged {s.DocumentsUnchanged}, deleted {s.DocumentsDeleted}, quarantined {s.DocumentsQuarantined}, deferred {s.DocumentsDeferred}"));
        if (s.FilesSkippedByPattern > 0 || s.FilesUnsupported > 0)
        {
            var types = string.Join(", ", s.UnsupportedTypes.OrderByDescending(t => t.Value).Take(8).Select(t => string.Create(c, $"{t.Key} {t.Value}")));
            output.WriteLine(string.Create(c, $"  passed over {s.FilesSkippedByPattern} file(s) left out by the root's globs, {s.FilesUnsupported} of a type no reader takes{(types.Length > 0 ? $" ({types})" : string.Empty)}"));
        }

        if (s.DocumentsCopied > 0 || s.DocumentsMoved > 0)
        {
            output.WriteLine(string.Create(c, $"             of which copies of indexed bytes {s.DocumentsCopied} (read for free), moves or renames {s.DocumentsMoved}"));
        }

        output.WriteLine(string.Create(c, $"  pages      seen {s.PagesSeen}: new {s.PagesNew} (need vectors), reused {s.PagesReused} (free), removed {s.PagesRemoved}, embedded {s.PagesEmbedded}"));
        if (s.PagesDrifted > 0 || s.PagesQueuedForMigration > 0)
        {
            output.WriteLine(string.Create(c, $"  drift      {s.PagesDrifted} page(s) still served by the old encoder, {s.PagesMigrated} migrated; {s.PagesQueuedForMigration} queued for migration in this pass"));
        }

        if (s.EncoderSwitchedOver)
        {
            output.WriteLine($"  drift      migration complete: encoder {s.ServingEncoderId[..12]} now serves; the old vectors are dead and compaction reclaims them");
        }

        if (s.DocumentsQuarantined + s.FilesUnreadable > 0)
        {
            output.WriteLine(string.Create(c, $"  unreadable {s.DocumentsQuarantined + s.FilesUnreadable} file(s) in this pass: {s.DocumentsQuarantined} quarantined (read again when they change; `status` says why), {s.FilesUnreadable} could not be opened (tried again next pass)"));
        }

        foreach (var root in s.RootsMissing)
        {
            output.WriteLine($"  root '{root}' was not found: its documents were kept, not deleted.");
        }

        foreach (var problem in s.Problems.Take(20))
        {
            output.WriteLine("  problem: " + problem);
        }

        if (s.Problems.Count > 20)
        {
            output.WriteLine(string.Create(c, $"  … and {s.Problems.Count - 20} more problems"));
        }
    }
}
