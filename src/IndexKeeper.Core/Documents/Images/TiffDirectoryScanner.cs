using System.Buffers.Binary;

namespace IndexKeeper.Core.Documents.Images;

/// <summary>
/// Lists the image file directories of a TIFF file (TIFF 6.0 §2: an 8-byte header, then a chain of
/// IFDs of 12-byte entries) with each page's size and orientation, without decoding any pixels, so
/// page count and decoded size can be refused before the decoder allocates anything.
/// </summary>
internal static class TiffDirectoryScanner
{
    private const ushort ImageWidthTag = 256;
    private const ushort ImageLengthTag = 257;
    private const ushort OrientationTag = 274;

    public static List<(long Width, long Height, int Orientation)> Scan(ReadOnlySpan<byte> file, int maxPages)
    {
        if (file.Length < 8)
        {
            throw Corrupt("the TIFF header is cut off");
        }

        var little = file[0] == (byte)'I';
        if (Read16(file, 2, little) == 43)
        {
            throw new DocumentReadException(QuarantineReason.Unsupported, "BigTIFF files are not supported");
        }

        var pages = new List<(long, long, int)>();
        var seen = new HashSet<long>();
        long offset = Read32(file, 4, little);
        while (offset != 0)
        {
            if (!seen.Add(offset))
            {
                throw Corrupt("the TIFF directory chain loops");
            }

            if (offset + 2 > file.Length)
            {
                throw Corrupt("a TIFF directory lies outside the file");
            }

            var count = Read16(file, (int)offset, little);
            var entries = (int)offset + 2;
            if (entries + (count * 12L) + 4 > file.Length)
            {
                throw Corrupt("a TIFF directory is cut off");
            }

            long width = 0, height = 0;
            var orientation = 1;
            for (var i = 0; i < count; i++)
            {
                var entry = entries + (i * 12);
                var tag = Read16(file, entry, little);
                var type = Read16(file, entry + 2, little);

                // SHORT (3) values sit in the first two bytes of the value field, LONG (4) in all four.
                long value = type == 3 ? Read16(file, entry + 8, little) : Read32(file, entry + 8, little);
                switch (tag)
                {
                    case ImageWidthTag: width = value; break;
                    case ImageLengthTag: height = value; break;
                    case OrientationTag: orientation = (int)Math.Clamp(value, 1, 8); break;
                }
            }

            pages.Add((width, height, orientation));
            if (pages.Count > maxPages)
            {
                throw new DocumentReadException(QuarantineReason.TooManyPages, $"more than {maxPages} pages (the limit)");
            }

            offset = Read32(file, entries + (count * 12), little);
        }

        return pages;
    }

    private static ushort Read16(ReadOnlySpan<byte> file, int at, bool little) =>
        little ? BinaryPrimitives.ReadUInt16LittleEndian(file[at..]) : BinaryPrimitives.ReadUInt16BigEndian(file[at..]);

    private static uint Read32(ReadOnlySpan<byte> file, int at, bool little) =>
        little ? BinaryPrimitives.ReadUInt32LittleEndian(file[at..]) : BinaryPrimitives.ReadUInt32BigEndian(file[at..]);

    private static DocumentReadException Corrupt(string message) => new(QuarantineReason.Corrupt, message);
}
