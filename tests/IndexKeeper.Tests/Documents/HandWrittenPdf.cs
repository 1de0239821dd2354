using System.Globalization;
using System.Text.RegularExpressions;

namespace IndexKeeper.Tests.Documents;

/// <summary>
/// Writes small PDFs by hand for what PdfPig's builder cannot make (form XObjects, ExtGState, chosen
/// filters, incremental updates), following ISO 32000-1 §7.5: header (§7.5.2), body of indirect objects
/// (§7.5.3), one cross-reference section (§7.5.4) and trailer (§7.5.5).
/// </summary>
internal sealed partial class HandWrittenPdf
{
    private readonly SortedDictionary<int, byte[]> objects = [];
    private int next = 1;

    /// <summary>Reserves an object number to be filled later (for objects that refer to each other).</summary>
    public int Reserve() => next++;

    public int Add(string body)
    {
        var number = Reserve();
        Set(number, body);
        return number;
    }

    public int AddStream(string dictionaryEntries, byte[] data)
    {
        var number = Reserve();
        SetStream(number, dictionaryEntries, data);
        return number;
    }

    public void Set(int number, string body) => objects[number] = System.Text.Encoding.Latin1.GetBytes(body);

    /// <summary>A stream object (§7.3.8): the dictionary gets the right /Length.</summary>
    public void SetStream(int number, string dictionaryEntries, byte[] data) => objects[number] = StreamBody(dictionaryEntries, data);

    public byte[] Build(int root, string trailerExtra = "")
    {
        var output = new MemoryStream();
        Write(output, "%PDF-1.7\n%\u00e2\u00e3\u00cf\u00d3\n");
        var offsets = new Dictionary<int, long>();
        foreach (var (number, body) in objects)
        {
            offsets[number] = output.Position;
            Write(output, $"{number} 0 obj\n");
            output.Write(body);
            Write(output, "\nendobj\n");
        }

        var size = objects.Keys.Max() + 1;
        var xref = output.Position;
        Write(output, $"xref\n0 {size}\n0000000000 65535 f \n");
        for (var n = 1; n < size; n++)
        {
            Write(output, offsets.TryGetValue(n, out var at) ? $"{at:D10} 00000 n \n" : "0000000000 65535 f \n");
        }

        Write(output, $"trailer\n<< /Size {size} /Root {root} 0 R {trailerExtra}>>\nstartxref\n{xref}\n%%EOF\n");
        return output.ToArray();
    }

    /// <summary>
    /// Appends an incremental update (ISO 32000-1 §7.5.6) to a file with a classic cross-reference table:
    /// the new or replaced objects, a cross-reference section for just them, and a trailer whose /Prev
    /// points at the previous section. Objects are given as number → body (bytes, written as they are).
    /// </summary>
    public static byte[] AppendUpdate(byte[] original, IReadOnlyDictionary<int, byte[]> changed, string trailerExtra = "")
    {
        var text = System.Text.Encoding.Latin1.GetString(original);
        var previousXref = long.Parse(StartXref().Matches(text)[^1].Groups[1].Value, CultureInfo.InvariantCulture);
        var trailer = TrailerDictionary().Matches(text)[^1].Groups[1].Value;
        var size = int.Parse(SizeEntry().Match(trailer).Groups[1].Value, CultureInfo.InvariantCulture);
        var root = RootEntry().Match(trailer).Groups[1].Value;
        var info = InfoEntry().Match(trailer);

        var output = new MemoryStream();
        output.Write(original);
        if (original[^1] != (byte)'\n')
        {
            Write(output, "\n");
        }

        var offsets = new SortedDictionary<int, long>();
        foreach (var (number, body) in changed)
        {
            offsets[number] = output.Position;
            Write(output, $"{number} 0 obj\n");
            output.Write(body);
            Write(output, "\nendobj\n");
        }

        var xref = output.Position;
        Write(output, "xref\n");
        foreach (var (number, at) in offsets)
        {
            // One subsection per object keeps the writer simple; §7.5.4 allows any number of them.
            Write(output, $"{number} 1\n{at:D10} 00000 n \n");
        }

        var newSize = Math.Max(size, offsets.Keys.Max() + 1);
        var infoPart = trailerExtra.Contains("/Info", StringComparison.Ordinal) || !info.Success ? string.Empty : info.Value + " ";
        Write(output, $"trailer\n<< /Size {newSize} /Root {root} {infoPart}/Prev {previousXref} {trailerExtra}>>\nstartxref\n{xref}\n%%EOF\n");
        return output.ToArray();
    }

    /// <summary>Size of the file's object-number space, read from its last trailer (for new object numbers).</summary>
    public static int SizeOf(byte[] file)
    {
        var trailer = TrailerDictionary().Matches(System.Text.Encoding.Latin1.GetString(file))[^1].Groups[1].Value;
        return int.Parse(SizeEntry().Match(trailer).Groups[1].Value, CultureInfo.InvariantCulture);
    }

    public static byte[] StreamBody(string dictionaryEntries, byte[] data)
    {
        var output = new MemoryStream();
        Write(output, $"<< {dictionaryEntries} /Length {data.Length} >>\nstream\n");
        output.Write(data);
        Write(output, "\nendstream");
        return output.ToArray();
    }

    public static byte[] Latin1(string text) => System.Text.Encoding.Latin1.GetBytes(text);

    private static void Write(Stream output, string text) => output.Write(System.Text.Encoding.Latin1.GetBytes(text));

    [GeneratedRegex(@"startxref\s+(\d+)")]
    private static partial Regex StartXref();

    [GeneratedRegex(@"trailer\s*<<(.*?)>>\s*startxref", RegexOptions.Singleline)]
    private static partial Regex TrailerDictionary();

    [GeneratedRegex(@"/Size\s+(\d+)")]
    private static partial Regex SizeEntry();

    [GeneratedRegex(@"/Root\s+(\d+\s+\d+\s+R)")]
    private static partial Regex RootEntry();

    [GeneratedRegex(@"/Info\s+\d+\s+\d+\s+R")]
    private static partial Regex InfoEntry();
}
