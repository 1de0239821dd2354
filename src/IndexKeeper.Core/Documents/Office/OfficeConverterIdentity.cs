using IndexKeeper.Core.Documents.Tools;

namespace IndexKeeper.Core.Documents.Office;

/// <summary>
/// Which LibreOffice draws office files here. Its version line is part of every converted page's key
/// (<see cref="ConvertedPageKey"/>), so a document drawn by another version is read again and its pages
/// get their keys, planned before any encoder call (docs/readers.md, "Converter upgrades").
/// </summary>
public static class OfficeConverterIdentity
{
    /// <summary>The installed converter's version line (e.g. "LibreOffice 7.4.7.2 40(Build:2)"), or null when it is missing.</summary>
    /// <param name="program">The configured program (<see cref="ReaderSettings.OfficeConverter"/>): a path, or a name on PATH.</param>
    public static string? Installed(string program) => ToolVersion.Find(program, OfficeConverter.VersionPrefix)?.Version;

    /// <summary>Whether documents of this kind are drawn by the converter.</summary>
    public static bool Draws(DocumentKind kind) =>
        kind is DocumentKind.OfficeOpenXml or DocumentKind.OpenDocument or DocumentKind.RichText or DocumentKind.LegacyOffice;
}
