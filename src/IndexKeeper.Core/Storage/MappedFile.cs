using System.IO.MemoryMappedFiles;

namespace IndexKeeper.Core.Storage;

/// <summary>
/// A read-only memory map of a segment file, its length fixed when mapped, with a reference count: the
/// map is undone when the last holder releases it, and only then may the file be deleted (Windows
/// refuses to delete a mapped file; on Linux the space would not come back anyway).
/// </summary>
internal sealed unsafe class MappedFile
{
    private readonly MemoryMappedFile? map;
    private readonly MemoryMappedViewAccessor? view;
    private readonly byte* start;
    private readonly byte* mapped;
    private readonly Action<MappedFile>? onUnmapped;
    private int references = 1;

    private MappedFile(string path, long length, MemoryMappedFile? map, MemoryMappedViewAccessor? view, Action<MappedFile>? onUnmapped)
    {
        Path = path;
        Length = length;
        this.map = map;
        this.view = view;
        this.onUnmapped = onUnmapped;
        if (view is not null)
        {
            byte* pointer = null;
            view.SafeMemoryMappedViewHandle.AcquirePointer(ref pointer);
            mapped = pointer;
            start = pointer + view.PointerOffset;
        }
    }

    public string Path { get; }

    public long Length { get; }

    /// <summary>Maps the file as it is now; the caller holds the first reference.</summary>
    public static MappedFile Open(string path, Action<MappedFile>? onUnmapped = null)
    {
        if (!BitConverter.IsLittleEndian)
        {
            throw new PlatformNotSupportedException("Segments are little-endian and are read in place; this machine is big-endian.");
        }

        // ReadWrite and Delete sharing: the writer may still append to an open segment, and retiring a
        // segment must not wait for this handle.
        var stream = new FileStream(path, FileMode.Open, FileAccess.Read, FileShare.ReadWrite | FileShare.Delete);
        try
        {
            var length = stream.Length;
            if (length == 0)
            {
                stream.Dispose();
                return new MappedFile(path, 0, null, null, onUnmapped);
            }

            var map = MemoryMappedFile.CreateFromFile(stream, null, 0, MemoryMappedFileAccess.Read, HandleInheritability.None, leaveOpen: false);
            try
            {
                return new MappedFile(path, length, map, map.CreateViewAccessor(0, length, MemoryMappedFileAccess.Read), onUnmapped);
            }
            catch
            {
                map.Dispose();
                throw;
            }
        }
        catch
        {
            stream.Dispose();
            throw;
        }
    }

    /// <summary>The bytes at <paramref name="offset"/>; valid while a reference is held.</summary>
    public ReadOnlySpan<byte> Span(long offset, int length)
    {
        if (offset < 0 || length < 0 || offset > Length - length)
        {
            throw new ArgumentOutOfRangeException(nameof(offset), $"bytes {offset}..{offset + length} lie outside the {Length}-byte mapping of {Path}");
        }

        return length == 0 ? [] : new ReadOnlySpan<byte>(start + offset, length);
    }

    /// <summary>The bytes from <paramref name="offset"/> to the end, at most int.MaxValue of them.</summary>
    public ReadOnlySpan<byte> Rest(long offset) => Span(offset, (int)Math.Min(Length - offset, int.MaxValue));

    /// <summary>
    /// Lets go of the file's pages this process holds resident (<see cref="ResidentPages"/>); the bytes read
    /// the same afterwards. REQUIRES: the caller holds a reference.
    /// </summary>
    public void DropResident()
    {
        if (view is not null)
        {
            ResidentPages.Drop(mapped, Length + view.PointerOffset);
        }
    }

    /// <summary>REQUIRES: the caller already holds a reference (so the count cannot be zero).</summary>
    public void AddReference()
    {
        var now = Interlocked.Increment(ref references);
        System.Diagnostics.Debug.Assert(now > 1, "AddReference on a released mapping");
    }

    public void Release()
    {
        var now = Interlocked.Decrement(ref references);
        System.Diagnostics.Debug.Assert(now >= 0, "mapping released more often than referenced");
        if (now != 0)
        {
            return;
        }

        if (view is not null)
        {
            view.SafeMemoryMappedViewHandle.ReleasePointer();
            view.Dispose();
        }

        map?.Dispose();
        onUnmapped?.Invoke(this);
    }
}
