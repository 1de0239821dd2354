using IndexKeeper.Core.Documents;
using IndexKeeper.Core.Faults;

namespace IndexKeeper.Core.Storage;

/// <summary>
/// Page words and boxes kept outside the catalog (docs/page-words-format.md): append-only files in
/// <c>words/</c>, one framed record per page key, found through the location the catalog keeps on the page.
/// Text encoders, snippets and match maps read them; nothing else does.
/// REQUIRES (writing): the index lock is held; <see cref="Append"/> returns only when the bytes are durable,
/// before the catalog commit that names them (the same order as segment bytes).
/// </summary>
public sealed class PageWordStore : IDisposable
{
    /// <summary>A file takes records until it passes this size; the next append starts another.</summary>
    private const long RollAtBytes = 64L * 1024 * 1024;

    private readonly string folder;
    private readonly bool writable;
    private readonly Lock gate = new();
    private FileStream? open;
    private long openId;
    private long nextId;

    private PageWordStore(string folder, bool writable, long nextId)
    {
        this.folder = folder;
        this.writable = writable;
        this.nextId = nextId;
    }

    /// <summary>The store of a locked index: appends go to a new file after the highest id present.</summary>
    public static PageWordStore OpenForWriting(string indexDirectory)
    {
        var folder = Path.Combine(indexDirectory, PageWordFormat.Folder);
        var highest = Directory.Exists(folder)
            ? Directory.EnumerateFiles(folder).Select(f => PageWordFormat.IdOf(Path.GetFileName(f))).Max() ?? 0
            : 0;
        return new PageWordStore(folder, writable: true, highest + 1);
    }

    /// <summary>The store read beside a writer: never creates or changes a file.</summary>
    public static PageWordStore OpenForReading(string indexDirectory) =>
        new(Path.Combine(indexDirectory, PageWordFormat.Folder), writable: false, 0);

    /// <summary>
    /// Appends the words of each page and makes them durable (file fsync; a new file's directory entry too).
    /// Returns one location per page, in order. On a failure nothing returned is committed anywhere, and the
    /// next append starts a new file (the failed one keeps a torn tail that no location names).
    /// </summary>
    public IReadOnlyList<PageWordsLocation> Append(IReadOnlyList<(PageKey Key, IReadOnlyList<PageWord> Words)> pages)
    {
        ArgumentNullException.ThrowIfNull(pages);
        if (!writable)
        {
            throw new InvalidOperationException("The page-word store was opened for reading.");
        }

        lock (gate)
        {
            var locations = new PageWordsLocation[pages.Count];
            try
            {
                var stream = Writable();
                for (var i = 0; i < pages.Count; i++)
                {
                    var record = PageWordFormat.Encode(pages[i].Key, pages[i].Words, out var checksum);
                    locations[i] = new PageWordsLocation(openId, stream.Position, record.Length, checksum);
                    stream.Write(record);
                }

                FaultInjection.Reach(FaultPoints.WordsAppendBeforeFsync);
                stream.Flush(flushToDisk: true);
                FaultInjection.Reach(FaultPoints.WordsAppendAfterFsync);
                if (stream.Length >= RollAtBytes)
                {
                    CloseOpen();
                }
            }
            catch
            {
                CloseOpen();
                throw;
            }

            return locations;
        }
    }

    /// <summary>The words at <paramref name="location"/>; throws <see cref="InvalidDataException"/> when they fail their checks.</summary>
    public IReadOnlyList<PageWord> Read(PageKey key, PageWordsLocation location)
    {
        var path = Path.Combine(folder, PageWordFormat.FileName(location.File));
        if (!File.Exists(path))
        {
            throw new InvalidDataException($"The page words of {key.Hex} are in {path}, which is missing.");
        }

        using var handle = File.OpenHandle(path, FileMode.Open, FileAccess.Read, FileShare.ReadWrite | FileShare.Delete);
        var header = new byte[PageWordFormat.HeaderLength];
        var problem = RandomAccess.Read(handle, header, 0) == header.Length ? PageWordFormat.CheckHeader(header, location.File) : "cut short";
        if (problem is not null)
        {
            throw new InvalidDataException($"{path}: {problem}.");
        }

        var record = new byte[location.Length];
        var read = RandomAccess.Read(handle, record, location.Offset);
        return PageWordFormat.Decode(record.AsSpan(0, read), location, key, path);
    }

    /// <summary>Every page-word file by id with its length on disk; what compaction weighs against the catalog's live bytes.</summary>
    public IReadOnlyList<(long Id, long Bytes)> Files()
    {
        if (!Directory.Exists(folder))
        {
            return [];
        }

        return Directory.EnumerateFiles(folder)
            .Select(f => (Path: f, Id: PageWordFormat.IdOf(Path.GetFileName(f))))
            .Where(f => f.Id is not null)
            .Select(f => (f.Id!.Value, new FileInfo(f.Path).Length))
            .OrderBy(f => f.Item1)
            .ToList();
    }

    /// <summary>The file this process appends to now, if any; compaction leaves it alone.</summary>
    public long? OpenFileId
    {
        get
        {
            lock (gate)
            {
                return open is null ? null : openId;
            }
        }
    }

    /// <summary>
    /// Copies the live records of a file into a new file (a fresh id), checking each as <see cref="Read"/> does,
    /// and makes it durable with its directory entry. Nothing names the new file until the caller's catalog
    /// commit; the old file is untouched. A record that fails its checks throws <see cref="InvalidDataException"/>
    /// and the new file is removed, so a damaged file is reported and kept, never rewritten without its words.
    /// </summary>
    public PageWordsRewrite Rewrite(long fileId, IReadOnlyList<(PageKey Key, PageWordsLocation At)> live)
    {
        ArgumentNullException.ThrowIfNull(live);
        if (!writable)
        {
            throw new InvalidOperationException("The page-word store was opened for reading.");
        }

        long newId;
        lock (gate)
        {
            newId = nextId++;
        }

        var path = Path.Combine(folder, PageWordFormat.FileName(newId));
        var moves = new Dictionary<PageKey, PageWordsLocation>(live.Count);
        long read = 0;
        try
        {
            using (var stream = new FileStream(path, FileMode.CreateNew, FileAccess.Write, FileShare.Read | FileShare.Delete))
            {
                stream.Write(PageWordFormat.Header(newId));
                foreach (var (key, at) in live.OrderBy(l => l.At.Offset))
                {
                    if (at.File != fileId)
                    {
                        throw new ArgumentException($"The words of {key.Hex} are in file {at.File}, not {fileId}.", nameof(live));
                    }

                    // Decoded and encoded again rather than copied blind: the body is checked against both checksums on the way.
                    var words = Read(key, at);
                    var record = PageWordFormat.Encode(key, words, out var checksum);
                    moves[key] = new PageWordsLocation(newId, stream.Position, record.Length, checksum);
                    stream.Write(record);
                    read += at.Length;
                }

                FaultInjection.Reach(FaultPoints.WordsCompactionBeforeFsync);
                stream.Flush(flushToDisk: true);
            }

            DirectorySync.Flush(folder);
            return new PageWordsRewrite(fileId, newId, moves, read, new FileInfo(path).Length);
        }
        catch
        {
            // Named by no catalog record: removing it loses nothing.
            File.Delete(path);
            throw;
        }
    }

    /// <summary>
    /// Deletes a file the catalog no longer names (after the commit that moved its live records away).
    /// REQUIRES: the index lock is held and no process reads the store (the caller holds the reader gate exclusively).
    /// </summary>
    public void Delete(long fileId)
    {
        if (!writable)
        {
            throw new InvalidOperationException("The page-word store was opened for reading.");
        }

        FaultInjection.Reach(FaultPoints.WordsCompactionDeleteBefore);
        File.Delete(Path.Combine(folder, PageWordFormat.FileName(fileId)));
        DirectorySync.Flush(folder);
    }

    public void Dispose()
    {
        lock (gate)
        {
            CloseOpen();
        }
    }

    private FileStream Writable()
    {
        if (open is not null)
        {
            return open;
        }

        var created = !Directory.Exists(folder);
        Directory.CreateDirectory(folder);
        if (created)
        {
            DirectorySync.Flush(Path.GetDirectoryName(folder)!);
        }

        // A file of its own per writing process: a file another process left with a torn tail is never appended to.
        var id = nextId++;
        var path = Path.Combine(folder, PageWordFormat.FileName(id));
        var stream = new FileStream(path, FileMode.CreateNew, FileAccess.Write, FileShare.Read | FileShare.Delete);
        try
        {
            stream.Write(PageWordFormat.Header(id));
            stream.Flush(flushToDisk: true);
            DirectorySync.Flush(folder);
        }
        catch
        {
            stream.Dispose();
            throw;
        }

        (open, openId) = (stream, id);
        return stream;
    }

    private void CloseOpen()
    {
        open?.Dispose();
        open = null;
    }
}
