using System.Diagnostics;
using IndexKeeper.Core.Catalog;
using IndexKeeper.Core.Detect;
using IndexKeeper.Core.Diff;
using IndexKeeper.Core.Documents;
using IndexKeeper.Core.Documents.Office;
using IndexKeeper.Core.Queue;
using IndexKeeper.Core.Storage;
using IndexKeeper.Core.Telemetry;

namespace IndexKeeper.Core.Pipeline;

/// <summary>
/// One pass of Detect → Read → Diff over every root: finds what is new, changed, moved, copied or gone,
/// reads only files whose bytes are new to the index, and commits documents, page reference counts and
/// queued page keys in batches (one transaction each). Embeds nothing.
/// </summary>
/// <remarks>REQUIRES: the caller holds the index lock; one pass at a time per catalog.</remarks>
public sealed class ScanPass
{
    private readonly IndexCatalog catalog;
    private readonly PageWordStore words;
    private readonly IDocumentReader reader;
    private readonly ScanSettings settings;
    private readonly IProgress<ScanProgress>? progress;
    private readonly IFileProbe probe;
    private readonly TimeProvider clock;
    private readonly Dictionary<string, RootGlobs> globs = new(StringComparer.Ordinal);

    public ScanPass(IndexCatalog catalog, PageWordStore words, IDocumentReader reader, ScanSettings settings, IProgress<ScanProgress>? progress = null)
        : this(catalog, words, reader, settings, progress, new FileSystemProbe(), TimeProvider.System)
    {
    }

    internal ScanPass(IndexCatalog catalog, PageWordStore words, IDocumentReader reader, ScanSettings settings, IProgress<ScanProgress>? progress, IFileProbe probe, TimeProvider clock)
    {
        this.catalog = catalog;
        this.words = words;
        this.reader = reader;
        this.settings = settings;
        this.progress = progress;
        this.probe = probe;
        this.clock = clock;
    }

    public ScanSummary Run(string command, CancellationToken cancellationToken) => Pass(command, dryRun: false, cancellationToken).Summary;

    /// <summary>
    /// The same pass as a dry run for the plan: walks, hashes and reads what <see cref="Run"/> would, but
    /// writes nothing (no catalog edit, no scan record) and does not wait for files still being written.
    /// </summary>
    public ScanPreview Preview(CancellationToken cancellationToken)
    {
        var state = Pass(command: null, dryRun: true, cancellationToken);
        var removed = state.Ledger.TakeTouched().Where(t => t.ExistedBefore && t.References <= 0).Select(t => t.Key.Hex).ToHashSet(StringComparer.Ordinal);
        removed.UnionWith(catalog.Pages.UnreferencedKeys());
        state.Summary.PagesRemoved = removed.Count;
        return new ScanPreview(
            state.Summary,
            state.Changes,
            state.NewPages.Keys.Select(k => k.Hex).ToList(),
            removed,
            state.Sampler.Strata(state.NewPages.ContainsKey));
    }

    private ScanPassState Pass(string? command, bool dryRun, CancellationToken cancellationToken)
    {
        using var activity = CoreTelemetry.Traces.StartActivity("scan");
        activity?.SetTag("indexkeeper.scan.kind", "full");
        var state = Begin(dryRun);
        var found = new List<FoundFile>();
        var walkedRoots = new List<RootSpec>();
        foreach (var root in settings.Roots)
        {
            var missing = false;
            foreach (var file in probe.Walk(root, p => missing |= state.Report(p), state.Summary.RecordPassedOver, cancellationToken))
            {
                found.Add(file);
                if (found.Count % 1000 == 0)
                {
                    progress?.Report(new ScanProgress("walking", found.Count, 0, file.RelativePath));
                }
            }

            if (missing)
            {
                state.Summary.RootsMissing.Add(root.Name);
            }
            else
            {
                walkedRoots.Add(root);
            }
        }

        state.Summary.DocumentsSeen = found.Count;
        foreach (var root in settings.Roots)
        {
            // A full pass reads each root's documents once: one lookup per file costs more than its stat.
            state.Known(root.Name);
        }

        ProcessFound(state, found, reportProgress: true, cancellationToken);
        foreach (var root in walkedRoots)
        {
            foreach (var gone in state.Known(root.Name).Values.Where(d => !state.Seen.Contains(d.Id) && !state.IsUnknown(d)).ToList())
            {
                Delete(state, gone);
                FlushIfFull(state);
            }
        }

        return Finish(state, command);
    }

    /// <summary>
    /// A targeted pass over paths that notifications named: each file that is there (a regular file the
    /// root's globs select, reached through real folders only) is checked and read as in a full pass; each
    /// path that is gone, or that is a link or excluded now, loses its document. Paths whose state cannot be
    /// seen are left as they are. Folders are the caller's business (a full walk of the root).
    /// </summary>
    public ScanSummary RunPaths(string command, IReadOnlyCollection<ChangedPath> paths, CancellationToken cancellationToken)
    {
        ArgumentNullException.ThrowIfNull(paths);
        using var activity = CoreTelemetry.Traces.StartActivity("scan");
        activity?.SetTag("indexkeeper.scan.kind", "targeted");
        activity?.SetTag("indexkeeper.paths", paths.Count);
        var state = Begin(dryRun: false);
        var found = new List<FoundFile>();
        var gone = new List<DocumentRecord>();
        foreach (var path in paths.Distinct())
        {
            if (settings.Roots.FirstOrDefault(r => r.Name == path.Root) is not { } root)
            {
                continue;
            }

            var full = Path.Combine(root.Path, path.RelativePath.Replace('/', Path.DirectorySeparatorChar));
            var entry = ThroughRealFolders(root.Path, path.RelativePath) ? FileStatReader.Read(full) : EntryStat.Failed(EntryKind.Link, "a folder on the way is a link");
            var known = state.Find(path.Root, DocumentRecord.MakeId(path.Root, path.RelativePath));
            switch (entry.Kind)
            {
                case EntryKind.RegularFile when Selects(root, path.RelativePath):
                    found.Add(new FoundFile(path.Root, path.RelativePath, full, entry.Stat));
                    break;
                case EntryKind.Inaccessible:
                    state.Summary.FilesUnreadable++;
                    state.Summary.Problems.Add($"{path.Root}/{path.RelativePath}: {entry.Error}");
                    break;
                case EntryKind.Directory:
                    break;
                default:
                    if (known is not null)
                    {
                        gone.Add(known);
                    }

                    break;
            }
        }

        state.Summary.DocumentsSeen = found.Count;
        ProcessFound(state, found, reportProgress: false, cancellationToken);

        // New paths first, deletions after: a move's new path then finds the old one as a copy source.
        foreach (var document in gone)
        {
            Delete(state, document);
            FlushIfFull(state);
        }

        return Finish(state, command).Summary;
    }

    /// <summary>
    /// Forgets every document of a root (one gone longer than its grace time, or named by <c>forget-root</c>):
    /// their page references drop, pages no document holds are removed, their vector sets become dead.
    /// </summary>
    public ScanSummary RunForgetRoot(string command, string rootName, CancellationToken cancellationToken)
    {
        var state = Begin(dryRun: false);
        foreach (var document in catalog.Documents.OfRoot(rootName).ToList())
        {
            cancellationToken.ThrowIfCancellationRequested();
            Delete(state, document);
            FlushIfFull(state);
        }

        return Finish(state, command).Summary;
    }

    /// <summary>What <see cref="RunForgetRoot"/> would do, writing nothing: the root's documents and what becomes of their pages.</summary>
    public ForgetRootPreview PreviewForgetRoot(string rootName, CancellationToken cancellationToken)
    {
        var state = Begin(dryRun: true);
        var documents = 0L;
        foreach (var document in catalog.Documents.OfRoot(rootName))
        {
            cancellationToken.ThrowIfCancellationRequested();
            Delete(state, document);
            documents++;
        }

        var touched = state.Ledger.TakeTouched();
        var removed = touched.Count(t => t.ExistedBefore && t.References <= 0);
        return new ForgetRootPreview(rootName, documents, removed, touched.Count - removed);
    }

    private ScanPassState Begin(bool dryRun) => new(catalog, dryRun, clock.GetUtcNow().UtcDateTime);

    /// <summary>
    /// Checks and reads every found file (both kinds of pass): files still being written are put aside and
    /// taken once they have been quiet for the settle time; a dry run does not wait for them.
    /// </summary>
    private void ProcessFound(ScanPassState state, IReadOnlyList<FoundFile> found, bool reportProgress, CancellationToken cancellationToken)
    {
        var settling = new List<FoundFile>();
        var done = 0L;
        foreach (var file in found)
        {
            cancellationToken.ThrowIfCancellationRequested();
            state.Seen.Add(DocumentRecord.MakeId(file.Root, file.RelativePath));
            if (!state.DryRun && IsSettling(file.Stat))
            {
                settling.Add(file);
            }
            else
            {
                Process(state, file, cancellationToken);
            }

            if (reportProgress)
            {
                progress?.Report(new ScanProgress("checking", ++done, found.Count, file.RelativePath));
            }

            FlushIfFull(state);
        }

        ProcessSettled(state, settling, cancellationToken);
    }

    private ScanPassState Finish(ScanPassState state, string? command)
    {
        Flush(state);
        state.Summary.PagesNew = state.Ledger.PagesNew;
        state.Summary.PagesReused = state.Ledger.PagesReused;
        state.Summary.DocumentsMoved = state.NewHashes.Intersect(state.DeletedHashes).Count();
        if (!state.DryRun)
        {
            state.Summary.PagesRemoved = catalog.RemoveUnreferencedPages();
        }

        state.Summary.ElapsedSeconds = state.Stopwatch.Elapsed.TotalSeconds;
        if (!state.DryRun)
        {
            catalog.History.Add(ToRecord(command!, state.StartedUtc, state.Summary));
            CoreTelemetry.ScanDuration.Record(state.Summary.ElapsedSeconds);
        }

        return state;
    }

    /// <summary>True when every folder between the root and the path is a real folder (walks never follow a link out of a root).</summary>
    private static bool ThroughRealFolders(string rootPath, string relativePath)
    {
        var parts = relativePath.Split('/');
        var folder = rootPath;
        for (var i = 0; i < parts.Length - 1; i++)
        {
            folder = Path.Combine(folder, parts[i]);
            if (FileStatReader.Read(folder).Kind != EntryKind.Directory)
            {
                return false;
            }
        }

        return !parts.Any(p => p is "" or "." or "..");
    }

    private bool Selects(RootSpec root, string relativePath)
    {
        if (!globs.TryGetValue(root.Name, out var rootGlobs))
        {
            rootGlobs = new RootGlobs(root, OperatingSystem.IsWindows() ? StringComparison.OrdinalIgnoreCase : StringComparison.Ordinal);
            globs[root.Name] = rootGlobs;
        }

        var slash = relativePath.LastIndexOf('/');
        var name = relativePath[(slash + 1)..];
        var prefix = slash < 0 ? string.Empty : relativePath[..(slash + 1)];
        return rootGlobs.SelectFiles(prefix, [name]) is not { } selected || selected.Contains(name);
    }

    private bool IsSettling(FileStat stat) =>
        settings.Settle > TimeSpan.Zero && clock.GetUtcNow().UtcTicks - stat.ModifiedTicksUtc < settings.Settle.Ticks;

    /// <summary>Waits once for the youngest file to be quiet for the settle time, then takes those that stayed still.</summary>
    private void ProcessSettled(ScanPassState state, List<FoundFile> settling, CancellationToken cancellationToken)
    {
        if (settling.Count == 0)
        {
            return;
        }

        var youngest = settling.Max(f => f.Stat.ModifiedTicksUtc);
        var wait = TimeSpan.FromTicks(Math.Clamp(youngest + settings.Settle.Ticks - clock.GetUtcNow().UtcTicks, 0, settings.Settle.Ticks));
        progress?.Report(new ScanProgress($"waiting {wait.TotalSeconds:0.0} s for {settling.Count} file(s) still being written", 0, 0, null));
        cancellationToken.WaitHandle.WaitOne(wait);
        cancellationToken.ThrowIfCancellationRequested();
        foreach (var file in settling)
        {
            if (probe.Stat(file.FullPath) == file.Stat)
            {
                Process(state, file, cancellationToken);
            }
            else
            {
                state.Summary.DocumentsDeferred++;
            }

            FlushIfFull(state);
        }
    }

    private void Process(ScanPassState state, FoundFile file, CancellationToken cancellationToken)
    {
        var summary = state.Summary;
        var existing = state.Find(file.Root, DocumentRecord.MakeId(file.Root, file.RelativePath));
        var stored = existing is null ? null : StoredState.Of(existing);
        var toolRetry = existing is { State: DocumentState.Quarantined, QuarantineReason: QuarantineReason.ToolMissing }
            && !state.ToolsStillMissing.Contains(existing.QuarantineMessage ?? string.Empty);
        var readsDifferently = existing is not null && existing.ReaderVersion < ReaderVersion.Current && ReadsDifferently(existing);
        var redraw = existing is not null && DrawnByAnotherConverter(state, existing);
        var reread = (readsDifferently || redraw) && !state.RereadsHeld;
        if (toolRetry || reread)
        {
            // Read again although unchanged: the missing program may have been installed since, this
            // build's readers give what an older one could not (words by OCR, a format it did not read),
            // or another LibreOffice draws the document now (its pages' keys name the converter).
            stored = null;
        }

        if (QuickCheck.BeforeHash(stored, file.Stat).Verdict == QuickCheckVerdict.Unchanged)
        {
            summary.DocumentsUnchanged++;
            summary.PagesSeen += existing!.PageKeys.Count;
            if (!readsDifferently)
            {
                StampReaderVersion(state, existing);
            }

            StampConverter(state, existing);
            return;
        }

        summary.FilesHashed++;
        var hashed = probe.Hash(file, cancellationToken);
        switch (QuickCheck.AfterHash(stored, hashed))
        {
            case HashVerdict.Retry:
                summary.DocumentsDeferred++;
                return;
            case HashVerdict.Vanished:
                // Gone between the walk and the hash: not seen, so the end of the pass treats it as deleted.
                state.Seen.Remove(DocumentRecord.MakeId(file.Root, file.RelativePath));
                summary.DocumentsSeen--;
                return;
            case HashVerdict.Unreadable:
                // Seen but unreadable now: its catalog entry stays as it was.
                summary.FilesUnreadable++;
                summary.Problems.Add($"{file.Root}/{file.RelativePath}: {hashed.Detail}");
                return;
            case HashVerdict.Unchanged:
                // Touched but identical: one hash, no parse. Only the stat moves on.
                if (!readsDifferently)
                {
                    existing!.ReaderVersion = ReaderVersion.Current;
                }

                StoredState.Stamp(existing!, hashed);
                StampConverter(state, existing!);
                state.Edit.PutDocuments.Add(existing!);
                summary.DocumentsUnchanged++;
                summary.PagesSeen += existing!.PageKeys.Count;
                return;
        }

        var hash = Convert.ToHexStringLower(hashed.Sha256!);
        var now = clock.GetUtcNow().UtcDateTime;
        var record = existing ?? new DocumentRecord
        {
            Id = DocumentRecord.MakeId(file.Root, file.RelativePath),
            Root = file.Root,
            Path = file.RelativePath,
            FirstSeenUtc = now,
        };
        var oldKeys = existing is { State: DocumentState.Live } ? existing.PageKeys.Select(PageKey.Parse).ToList() : [];
        var changedBefore = record.LastChangedUtc;
        StoredState.Stamp(record, hashed);
        record.LastChangedUtc = now;

        IReadOnlyList<PageKey> newKeys;
        if (!reread && state.FindCopySource(hash) is { } source && source.PageKeys.All(k => state.IsKnownPage(PageKey.Parse(k))))
        {
            // A copy, rename or move of bytes the index already holds: take its pages without reading.
            summary.DocumentsCopied++;
            record.Kind = source.Kind;
            record.ReaderVersion = source.ReaderVersion;
            record.Converter = source.Converter;
            record.Title = source.Title;
            newKeys = source.PageKeys.Select(PageKey.Parse).ToList();
            state.Note(file, existing is null ? ChangeKind.Copied : ChangeKind.Changed, newKeys.Count, state.Ledger.Replace(oldKeys, newKeys).Count);
        }
        else
        {
            var content = Read(state, file, hashed.After, cancellationToken);
            if (content is null)
            {
                return;
            }

            if (reread)
            {
                summary.DocumentsReread++;
            }

            if (content.Value.Quarantine is { } failure)
            {
                if (reread && existing!.State == DocumentState.Live)
                {
                    // A live document read again for more never loses its pages to that read: it stays as
                    // it was. A missing program holds the other re-reads of this pass; another failure is
                    // final for this build.
                    summary.Problems.Add($"{file.Root}/{file.RelativePath}: read again for this build's readers and kept as it was: {failure.Message}");
                    state.RereadsHeld |= failure.Reason == QuarantineReason.ToolMissing;
                    existing.LastChangedUtc = changedBefore;
                    if (failure.Reason != QuarantineReason.ToolMissing)
                    {
                        // Final for this build and this converter: not tried again on every pass.
                        StampReaderVersion(state, existing);
                        if (redraw)
                        {
                            existing.Converter = InstalledConverter(state);
                            state.Edit.PutDocuments.Add(existing);
                        }
                    }

                    summary.DocumentsUnchanged++;
                    return;
                }

                if (toolRetry && failure.Reason == QuarantineReason.ToolMissing && failure.Message == existing!.QuarantineMessage)
                {
                    // Still missing: one read per pass proves it for every document waiting on the same program.
                    state.ToolsStillMissing.Add(failure.Message);
                    summary.DocumentsUnchanged++;
                    return;
                }

                record.State = DocumentState.Quarantined;
                record.ReaderVersion = ReaderVersion.Current;
                record.Converter = null;
                record.Title = null;
                record.Kind = DocumentKind.Unknown;
                record.PageKeys = [];
                record.QuarantineReason = failure.Reason;
                record.QuarantineMessage = failure.Message;
                state.Ledger.Replace(oldKeys, []);
                state.Note(file, ChangeKind.Quarantined, 0, 0);
                state.Edit.PutDocuments.Add(record);
                state.KnownHashes[hash] = record;
                if (failure.Reason == QuarantineReason.Unsupported && !ReadableTypes.IsReadable(file.RelativePath))
                {
                    // Selected by an include glob, of a type no reader takes: counted as such, not as a fault.
                    summary.RecordPassedOver(new PassedOverFile(file.Root, file.RelativePath, ReadableType: false));
                }
                else
                {
                    summary.DocumentsQuarantined++;
                }

                CountNewOrChanged(summary, existing);
                return;
            }

            var document = content.Value.Content!;
            record.Kind = document.Kind;
            record.ReaderVersion = ReaderVersion.Current;
            record.Converter = OfficeConverterIdentity.Draws(document.Kind) ? InstalledConverter(state) : null;
            record.Title = document.Title;
            newKeys = document.Pages.Select(p => p.Key).ToList();
            var fresh = state.Ledger.Replace(oldKeys, newKeys).ToHashSet();
            state.Note(file, existing is null ? ChangeKind.New : ChangeKind.Changed, newKeys.Count, fresh.Count);
            foreach (var page in document.Pages.Where(p => fresh.Remove(p.Key)))
            {
                var pageRecord = PageRecords.From(page, file, now);
                state.NewPages[page.Key] = pageRecord;

                // A dry run never writes pages: it keeps words only for the sample it may time the encoder on.
                if (state.DryRun && state.Sampler.Offer(document.Kind, page.Key, pageRecord) is { } evicted)
                {
                    state.NewPages[evicted] = ScanPassState.Placeholder;
                }
            }
        }

        record.State = DocumentState.Live;
        record.QuarantineReason = null;
        record.QuarantineMessage = null;
        record.PageKeys = newKeys.Select(k => k.Hex).ToList();
        state.Edit.PutDocuments.Add(record);
        state.KnownHashes[hash] = record;
        if (existing is null)
        {
            state.NewHashes.Add(hash);
        }

        summary.PagesSeen += newKeys.Count;
        CountNewOrChanged(summary, existing);
    }

    /// <summary>
    /// Whether a document read under an older <see cref="ReaderVersion"/> may read differently now: a
    /// quarantined one (a format or a program it lacked), or a live one with a page without words (OCR).
    /// </summary>
    private bool ReadsDifferently(DocumentRecord document) =>
        document is { State: DocumentState.Quarantined, QuarantineReason: not QuarantineReason.ToolMissing }
        || (document.State == DocumentState.Live && document.PageKeys.Any(k => catalog.Pages.Find(k) is { Words.Count: 0, WordsAt: null }));

    /// <summary>
    /// Whether a live document was drawn by another version of the office converter than the one installed:
    /// its pages' keys name that version (docs/page-keys.md), so it is read again and its pages re-keyed.
    /// </summary>
    private bool DrawnByAnotherConverter(ScanPassState state, DocumentRecord document) =>
        document is { State: DocumentState.Live, Converter: { } drawnBy }
        && OfficeConverterIdentity.Draws(document.Kind)
        && InstalledConverter(state) is { } installed
        && !string.Equals(installed, drawnBy, StringComparison.Ordinal);

    /// <summary>The installed converter's version line, asked once per pass; null when missing or not tracked.</summary>
    private string? InstalledConverter(ScanPassState state)
    {
        state.InstalledConverter ??= settings.OfficeConverter is { } program ? OfficeConverterIdentity.Installed(program) ?? string.Empty : string.Empty;
        return state.InstalledConverter.Length == 0 ? null : state.InstalledConverter;
    }

    /// <summary>
    /// A drawn document recorded before converters were kept is taken as drawn by the installed one (its keys
    /// cannot tell), once; from then on an upgrade reads it again.
    /// </summary>
    private void StampConverter(ScanPassState state, DocumentRecord document)
    {
        if (document is { State: DocumentState.Live, Converter: null } && OfficeConverterIdentity.Draws(document.Kind) && InstalledConverter(state) is { } installed)
        {
            document.Converter = installed;
            state.Edit.PutDocuments.Add(document);
        }
    }

    /// <summary>Records an unchanged document that needs no new read as read under this build's readers, once.</summary>
    private static void StampReaderVersion(ScanPassState state, DocumentRecord document)
    {
        if (document.ReaderVersion < ReaderVersion.Current)
        {
            document.ReaderVersion = ReaderVersion.Current;
            state.Edit.PutDocuments.Add(document);
        }
    }

    private static void CountNewOrChanged(ScanSummary summary, DocumentRecord? existing)
    {
        if (existing is null)
        {
            summary.DocumentsNew++;
        }
        else
        {
            summary.DocumentsChanged++;
        }
    }

    /// <summary>Reads a document; null when it changed while being read (deferred to the next pass).</summary>
    private (DocumentContent? Content, DocumentReadException? Quarantine)? Read(ScanPassState state, FoundFile file, FileStat hashedStat, CancellationToken cancellationToken)
    {
        if (file.Stat.Size > settings.Limits.MaxFileBytes)
        {
            return (null, new DocumentReadException(
                QuarantineReason.TooLarge,
                $"{file.Stat.Size} bytes is over the limit of {settings.Limits.MaxFileBytes} bytes (Limits:MaxFileMegabytes)."));
        }

        (DocumentContent?, DocumentReadException?) result;
        var started = Stopwatch.GetTimestamp();
        try
        {
            state.Summary.DocumentsRead++;
            result = (reader.Read(file.FullPath, settings.Limits, cancellationToken), null);
        }
        catch (DocumentReadException failure)
        {
            result = (null, failure);
        }

        var kind = result.Item1 is { } read ? ReadKindName(read.Kind) : UnreadableKind;
        var seconds = Stopwatch.GetElapsedTime(started).TotalSeconds;
        state.Summary.ReadSecondsByKind[kind] = state.Summary.ReadSecondsByKind.GetValueOrDefault(kind) + seconds;
        CoreTelemetry.DocumentReadDuration.Record(seconds, new KeyValuePair<string, object?>("kind", kind));

        if (probe.Stat(file.FullPath) != hashedStat)
        {
            // The bytes read may not be the bytes hashed: look again next pass.
            state.Summary.DocumentsDeferred++;
            return null;
        }

        return result;
    }

    private void Delete(ScanPassState state, DocumentRecord gone)
    {
        var keys = gone.State == DocumentState.Live ? gone.PageKeys.Select(PageKey.Parse).ToList() : [];
        state.Ledger.Replace(keys, []);
        state.Edit.DeleteDocuments.Add(gone.Id);
        state.DeletedHashes.Add(gone.FileHash);
        state.Summary.DocumentsDeleted++;
        if (state.DryRun)
        {
            state.Changes.Add(new PreviewChange(gone.Root, gone.Path, ChangeKind.Deleted, 0, 0));
        }
    }

    private void FlushIfFull(ScanPassState state)
    {
        if (state.Edit.PutDocuments.Count + state.Edit.DeleteDocuments.Count >= settings.BatchSize)
        {
            Flush(state);
        }
    }

    private void Flush(ScanPassState state)
    {
        if (state.DryRun)
        {
            // Nothing is written; the ledger keeps every count so later lookups never see the stale catalog.
            state.Edit = new CatalogEdit();
            return;
        }

        var edit = state.Edit;
        var now = clock.GetUtcNow().UtcDateTime;
        foreach (var (key, references, existedBefore) in state.Ledger.TakeTouched())
        {
            if (!existedBefore && state.NewPages.Remove(key, out var page))
            {
                page.References = references;
                edit.AddPages.Add(page);
                edit.Enqueue.Add(new QueueRecord { Id = key.Hex, Priority = QueuePriority.Fresh, EnqueuedUtc = now, NotBeforeUtc = now });
            }
            else
            {
                edit.SetReferences.Add((key.Hex, references));
            }
        }

        StoreWords(edit.AddPages);
        catalog.Apply(edit);
        state.Edit = new CatalogEdit();
    }

    /// <summary>The key under which failed reads count their time in <see cref="ScanSummary.ReadSecondsByKind"/>.</summary>
    private const string UnreadableKind = "unreadable";

    private static string ReadKindName(DocumentKind kind) => kind.ToString().ToLowerInvariant();

    /// <summary>
    /// Writes the new pages' words to the page-word store and leaves the records only their location. The
    /// bytes are durable before the catalog commit that names them, so a crash never leaves a page pointing
    /// at missing words; words written by a batch that never commits are named by nothing.
    /// </summary>
    private void StoreWords(List<PageRecord> added)
    {
        var withWords = added.Where(p => p.Words.Count > 0).ToList();
        if (withWords.Count == 0)
        {
            return;
        }

        var locations = words.Append(withWords.Select(p => (PageKey.Parse(p.Id), (IReadOnlyList<PageWord>)PageInput.Words(p.Words))).ToList());
        for (var i = 0; i < withWords.Count; i++)
        {
            var at = locations[i];
            withWords[i].WordsAt = new WordsAtRecord { File = at.File, Offset = at.Offset, Length = at.Length, Checksum = at.Checksum };
            withWords[i].Words = [];
        }
    }

    private static ScanRecord ToRecord(string command, DateTime started, ScanSummary summary) => new()
    {
        StartedUtc = started,
        ElapsedSeconds = summary.ElapsedSeconds,
        Command = command,
        Counts = new Dictionary<string, long>
        {
            ["documentsSeen"] = summary.DocumentsSeen,
            ["documentsNew"] = summary.DocumentsNew,
            ["documentsChanged"] = summary.DocumentsChanged,
            ["documentsUnchanged"] = summary.DocumentsUnchanged,
            ["documentsDeleted"] = summary.DocumentsDeleted,
            ["documentsQuarantined"] = summary.DocumentsQuarantined,
            [ScanRecord.FilesSkippedByPatternKey] = summary.FilesSkippedByPattern,
            [ScanRecord.FilesUnsupportedKey] = summary.FilesUnsupported,
            ["pagesNew"] = summary.PagesNew,
            ["pagesReused"] = summary.PagesReused,
            ["pagesRemoved"] = summary.PagesRemoved,
            [ScanRecord.ReadMillisecondsKey] = (long)Math.Round(summary.ReadSeconds * 1000),
        },
        UnsupportedTypes = summary.UnsupportedTypes.Select(t => new TypeCount { Type = t.Key, Files = t.Value }).ToList(),
    };
}
