using System.Text;

namespace IndexKeeper.Tests.Isolation;

/// <summary>
/// Writes a PDF byte by byte as ISO 32000-1 §7.5 lays out a file: header (§7.5.2), indirect objects
/// (§7.3.10), a cross-reference table of 20-byte entries (§7.5.4) and a trailer (§7.5.5). Objects are
/// numbered 1, 2, … in the order they are added; object 1 must be the catalog.
/// </summary>
internal sealed class HandWrittenPdf
{
    private readonly List<byte[]> objects = [];

    public int Add(string body) => Add(Latin1(body));

    /// <summary>A stream object (§7.3.8): the dictionary gets the /Length of the bytes as stored.</summary>
    public int AddStream(string dictionaryEntries, byte[] data) =>
        Add([.. Latin1($"<< {dictionaryEntries} /Length {data.Length} >>\nstream\n"), .. data, .. Latin1("\nendstream")]);

    public byte[] Build()
    {
        using var file = new MemoryStream();
        Write(file, "%PDF-1.7\n%\u00e2\u00e3\u00cf\u00d3\n");
        var offsets = new long[objects.Count];
        for (var i = 0; i < objects.Count; i++)
        {
            offsets[i] = file.Position;
            Write(file, $"{i + 1} 0 obj\n");
            file.Write(objects[i]);
            Write(file, "\nendobj\n");
        }

        var xref = file.Position;
        var table = new StringBuilder().Append($"xref\n0 {objects.Count + 1}\n0000000000 65535 f\r\n");
        foreach (var offset in offsets)
        {
            table.Append($"{offset:D10} 00000 n\r\n");
        }

        table.Append($"trailer\n<< /Size {objects.Count + 1} /Root 1 0 R >>\nstartxref\n{xref}\n%%EOF\n");
        Write(file, table.ToString());
        return file.ToArray();
    }

    private int Add(byte[] body)
    {
        objects.Add(body);
        return objects.Count;
    }

    private static byte[] Latin1(string text) => System.Text.Encoding.Latin1.GetBytes(text);

    private static void Write(Stream stream, string text) => stream.Write(Latin1(text));
}
