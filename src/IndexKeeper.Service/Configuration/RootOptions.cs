namespace IndexKeeper.Service.Configuration;

/// <summary>One configured root: a stable name, a folder, and glob filters relative to it.</summary>
public sealed class RootOptions
{
    /// <summary>Stable name stored in the catalog; renaming it re-indexes nothing but orphans the old name.</summary>
    public string Name { get; set; } = string.Empty;

    public string Path { get; set; } = string.Empty;

    /// <summary>The document types the reader understands; used when <see cref="Include"/> is empty.</summary>
    public static IReadOnlyList<string> SupportedTypes { get; } =
        ["**/*.pdf", "**/*.png", "**/*.jpg", "**/*.jpeg", "**/*.tif", "**/*.tiff", "**/*.docx", "**/*.xlsx", "**/*.pptx", "**/*.odt", "**/*.ods", "**/*.odp", "**/*.odg", "**/*.rtf", "**/*.doc", "**/*.xls", "**/*.ppt", "**/*.txt", "**/*.text", "**/*.md", "**/*.markdown", "**/*.html", "**/*.htm", "**/*.eml"];

    /// <summary>Globs a file must match (empty: <see cref="SupportedTypes"/>). Example: <c>manuals/**/*.pdf</c>.</summary>
    public List<string> Include { get; set; } = [];

    /// <summary>Globs that drop files or whole folders. Example: <c>**/~$*</c>, <c>tmp/**</c>.</summary>
    public List<string> Exclude { get; set; } = [];
}
