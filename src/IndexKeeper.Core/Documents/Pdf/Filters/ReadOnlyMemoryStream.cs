using System.Runtime.InteropServices;

namespace IndexKeeper.Core.Documents.Pdf.Filters;

/// <summary>Reads a memory block without copying it.</summary>
internal static class ReadOnlyMemoryStream
{
    public static Stream Create(ReadOnlyMemory<byte> memory) =>
        MemoryMarshal.TryGetArray(memory, out var segment) && segment.Array is not null
            ? new MemoryStream(segment.Array, segment.Offset, segment.Count, writable: false)
            : new MemoryStream(memory.ToArray(), writable: false);
}
