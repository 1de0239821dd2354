using System.Buffers;
using System.Security.Cryptography;

namespace IndexKeeper.Core.Detect;

/// <summary>
/// SHA-256 over a pooled buffer with a stat before and after. Stable means: the handle opened is the file
/// the baseline describes, it kept its size and modification time to the end of the read, exactly that
/// many bytes were read, and the path still names the same unchanged file afterwards.
/// </summary>
internal sealed class StreamingFileHasher(int bufferSize, TimeProvider clock, Action<long>? afterChunk) : IFileHasher
{
    public FileHashResult Hash(string path, CancellationToken cancellationToken)
    {
        var before = FileStatReader.Read(path);
        return before.Kind == EntryKind.RegularFile
            ? HashFrom(path, before.Stat, cancellationToken)
            : Refused(before, default);
    }

    public FileHashResult Hash(FoundFile file, CancellationToken cancellationToken)
    {
        ArgumentNullException.ThrowIfNull(file);
        return HashFrom(file.FullPath, file.Stat, cancellationToken);
    }

    private FileHashResult HashFrom(string path, FileStat before, CancellationToken cancellationToken)
    {
        cancellationToken.ThrowIfCancellationRequested();
        if (!FileOpener.TryOpen(path, out var handle, out var failure))
        {
            return Refused(failure, before);
        }

        using (handle)
        {
            var opened = FileStatReader.Read(handle);
            if (opened != before)
            {
                // A link, pipe or other file now sits at the path, or the file changed since its stat.
                return Unsettled(before, opened, "changed between stat and open");
            }

            var buffer = ArrayPool<byte>.Shared.Rent(bufferSize);
            long total = 0;
            byte[] digest;
            try
            {
                using var sha = IncrementalHash.CreateHash(HashAlgorithmName.SHA256);
                int read;
                while ((read = RandomAccess.Read(handle, buffer.AsSpan(0, bufferSize), total)) > 0)
                {
                    sha.AppendData(buffer, 0, read);
                    total += read;
                    afterChunk?.Invoke(total);
                    cancellationToken.ThrowIfCancellationRequested();
                }

                digest = sha.GetHashAndReset();
            }
            catch (IOException e)
            {
                return new FileHashResult(FileHashStatus.Inaccessible, null, before, before, Now(), e.Message);
            }
            finally
            {
                ArrayPool<byte>.Shared.Return(buffer);
            }

            // The clock is read before the last stat so that the racy-stat window errs towards re-hashing.
            var checkedAt = Now();
            var ended = FileStatReader.Read(handle);
            var after = FileStatReader.Read(path);
            if (ended != before || total != before.Size)
            {
                return Unsettled(before, ended, $"changed while being read ({total} of {before.Size} bytes read)");
            }

            if (after.Kind != EntryKind.RegularFile || after.Stat != before)
            {
                return Unsettled(before, after.Stat, $"path changed while being read ({after.Kind})");
            }

            return new FileHashResult(FileHashStatus.Stable, digest, before, after.Stat, checkedAt, null);
        }
    }

    private FileHashResult Unsettled(FileStat before, FileStat after, string detail) =>
        new(FileHashStatus.Unstable, null, before, after, Now(), detail);

    private FileHashResult Refused(EntryStat entry, FileStat before)
    {
        var status = entry.Kind switch
        {
            EntryKind.Missing => FileHashStatus.Missing,
            EntryKind.Inaccessible => FileHashStatus.Inaccessible,
            _ => FileHashStatus.NotRegularFile,
        };
        return new FileHashResult(status, null, before, entry.Stat, Now(), entry.Error ?? entry.Kind.ToString());
    }

    private long Now() => clock.GetUtcNow().UtcTicks;
}
