using IndexKeeper.Core.Catalog;
using IndexKeeper.Core.Detect;

namespace IndexKeeper.Core.Pipeline;

/// <summary>The stat comparison that lets an unchanged file cost nothing: size, modification time and file identity.</summary>
internal static class QuickCheck
{
    public static bool Matches(DocumentRecord record, FileStat stat) =>
        record.Size == stat.Size
        && record.ModifiedTicksUtc == stat.ModifiedTicksUtc
        && (ulong)record.Device == stat.Identity.Device
        && (ulong)record.FileIndex == stat.Identity.Index;

    public static void Stamp(DocumentRecord record, FileStat stat)
    {
        record.Size = stat.Size;
        record.ModifiedTicksUtc = stat.ModifiedTicksUtc;
        record.Device = unchecked((long)stat.Identity.Device);
        record.FileIndex = unchecked((long)stat.Identity.Index);
    }
}
