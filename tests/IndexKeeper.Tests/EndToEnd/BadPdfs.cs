using System.IO.Compression;
using IndexKeeper.Tests.Isolation;

namespace IndexKeeper.Tests.EndToEnd;

/// <summary>Damaged and hostile files the end-to-end tests build beside the good ones.</summary>
internal static class BadPdfs
{
    /// <summary>
    /// A good file whose body after the header (ISO 32000-1 §7.5.2) is overwritten with seeded random
    /// bytes: it still announces itself as a PDF, but no object, cross-reference table or trailer survives.
    /// </summary>
    public static byte[] Damaged(byte[] good)
    {
        var damaged = (byte[])good.Clone();
        var header = Array.IndexOf(damaged, (byte)'\n') + 1;
        new Random(20_261_201).NextBytes(damaged.AsSpan(header));
        return damaged;
    }

    /// <summary>
    /// One page whose content stream is FlateDecode-compressed (§7.4.4; zlib, RFC 1950/1951) spaces that
    /// inflate to <paramref name="inflatedMegabytes"/> MiB from a file of a few dozen KB.
    /// </summary>
    public static byte[] InflationBomb(int inflatedMegabytes)
    {
        using var compressed = new MemoryStream();
        using (var zlib = new ZLibStream(compressed, CompressionLevel.SmallestSize, leaveOpen: true))
        {
            var spaces = new byte[1024 * 1024];
            spaces.AsSpan().Fill((byte)' ');
            for (var i = 0; i < inflatedMegabytes; i++)
            {
                zlib.Write(spaces);
            }
        }

        var pdf = new HandWrittenPdf();
        pdf.Add("<< /Type /Catalog /Pages 2 0 R >>");
        pdf.Add("<< /Type /Pages /Kids [3 0 R] /Count 1 >>");
        pdf.Add("<< /Type /Page /Parent 2 0 R /MediaBox [0 0 612 792] /Contents 4 0 R >>");
        pdf.AddStream("/Filter /FlateDecode", compressed.ToArray());
        return pdf.Build();
    }
}
