namespace IndexKeeper.Core.Detect;

/// <summary>
/// The file types the readers turn into pages, by name extension in any letter case (a scanner on a
/// Windows share writes <c>SCAN0001.PDF</c>). A root with no include globs takes exactly these; with include
/// globs, the reader still decides by the file's bytes (docs/readers.md), so a PDF under another name is read.
/// </summary>
public static class ReadableTypes
{
    /// <summary>The extensions, lower case, with their dot; keep in step with docs/readers.md.</summary>
    public static IReadOnlyList<string> Extensions { get; } =
    [
        ".pdf", ".png", ".jpg", ".jpeg", ".tif", ".tiff",
        ".docx", ".xlsx", ".pptx", ".odt", ".ods", ".odp", ".odg", ".rtf", ".doc", ".xls", ".ppt",
        ".txt", ".text", ".md", ".markdown", ".html", ".htm", ".eml",
    ];

    private static readonly HashSet<string> Known = new(Extensions, StringComparer.OrdinalIgnoreCase);

    /// <summary>Whether a file of this name is of a readable type.</summary>
    public static bool IsReadable(string fileName) => Known.Contains(Path.GetExtension(fileName));

    /// <summary>The type a tally counts a file under: its extension in lower case, or "(none)".</summary>
    public static string TypeOf(string fileName)
    {
        var extension = Path.GetExtension(fileName);
        return extension.Length <= 1 ? "(none)" : extension.ToLowerInvariant();
    }
}
