using System.IO.Compression;
using System.Text.RegularExpressions;

namespace IndexKeeper.Core.Documents.Office;

/// <summary>
/// Looks inside an office file before the converter sees it: which kind it is (from its contents, never
/// its name), whether it is encrypted, whether its zip container inflates within the decoded-size cap,
/// and, for presentations, whether its slide count is within the page limit.
/// </summary>
internal static partial class OfficePackage
{
    /// <summary>Zip local file header "PK\x03\x04" (PKWARE APPNOTE.TXT §4.3.7).</summary>
    private static ReadOnlySpan<byte> ZipMagic => "PK\x03\x04"u8;

    /// <summary>OLE2 compound file signature ([MS-CFB] §2.2).</summary>
    private static ReadOnlySpan<byte> CompoundMagic => [0xD0, 0xCF, 0x11, 0xE0, 0xA1, 0xB1, 0x1A, 0xE1];

    /// <summary>Most entries a zip container may list; real office files have tens to a few thousand.</summary>
    private const int MaxEntries = 20_000;

    /// <summary>True when the bytes open as a container the converter may understand (zip, OLE2, RTF).</summary>
    public static bool IsCandidate(ReadOnlySpan<byte> file) =>
        file.StartsWith(ZipMagic) || file.StartsWith(CompoundMagic) || file.StartsWith("{\\rtf"u8);

    /// <summary>The kind and the file extension the converter is given.</summary>
    /// <exception cref="DocumentReadException">Encrypted, a zip bomb, too many slides, damaged, or not an office file.</exception>
    public static (DocumentKind Kind, string Extension) Inspect(byte[] file, ReadLimits limits, CancellationToken cancellationToken)
    {
        if (file.AsSpan().StartsWith("{\\rtf"u8))
        {
            return (DocumentKind.RichText, ".rtf");
        }

        return file.AsSpan().StartsWith(CompoundMagic) ? InspectCompound(file) : InspectZip(file, limits, cancellationToken);
    }

    private static (DocumentKind, string) InspectCompound(byte[] file)
    {
        // Stream names in the compound file's directory are UTF-16LE ([MS-CFB] §2.6.1); a search of the
        // bytes finds them without parsing the sector chains. An encrypted OOXML file is an OLE2 file with
        // an "EncryptedPackage" stream ([MS-OFFCRYPTO] §2.3.4.4).
        if (ContainsUtf16(file, "EncryptedPackage"))
        {
            throw new DocumentReadException(QuarantineReason.Encrypted, "the office file is password-protected (an encrypted package)");
        }

        if (ContainsUtf16(file, "WordDocument"))
        {
            return (DocumentKind.LegacyOffice, ".doc");
        }

        if (ContainsUtf16(file, "Workbook") || ContainsUtf16(file, "Book"))
        {
            return (DocumentKind.LegacyOffice, ".xls");
        }

        if (ContainsUtf16(file, "PowerPoint Document"))
        {
            return (DocumentKind.LegacyOffice, ".ppt");
        }

        throw new DocumentReadException(QuarantineReason.Unsupported, "an OLE2 compound file that is not a Word, Excel or PowerPoint document");
    }

    private static (DocumentKind, string) InspectZip(byte[] file, ReadLimits limits, CancellationToken cancellationToken)
    {
        ZipArchive archive;
        try
        {
            archive = new ZipArchive(new MemoryStream(file, writable: false), ZipArchiveMode.Read);
        }
        catch (InvalidDataException e)
        {
            throw new DocumentReadException(QuarantineReason.Corrupt, $"the office file's zip container is damaged: {e.Message}", e);
        }

        using (archive)
        {
            if (archive.Entries.Count > MaxEntries)
            {
                throw new DocumentReadException(QuarantineReason.TooManyParts, $"the zip container lists {archive.Entries.Count} entries, more than {MaxEntries}");
            }

            var names = archive.Entries.Select(e => e.FullName).ToHashSet(StringComparer.Ordinal);
            var (kind, extension) = Classify(archive, names);
            CheckInflation(archive, limits, cancellationToken);
            if (extension == ".pptx")
            {
                var slides = names.Count(n => SlidePart().IsMatch(n));
                if (slides > limits.MaxPages)
                {
                    throw new DocumentReadException(QuarantineReason.TooManyPages, $"{slides} slides, more than the limit of {limits.MaxPages} pages");
                }
            }

            return (kind, extension);
        }
    }

    private static (DocumentKind, string) Classify(ZipArchive archive, HashSet<string> names)
    {
        if (names.Contains("mimetype"))
        {
            // OpenDocument 1.3 part 2 §3.3: the "mimetype" entry names the document type.
            using var reader = new StreamReader(archive.GetEntry("mimetype")!.Open());
            var mime = new string(ReadUpTo(reader, 200)).Trim();
            if (archive.GetEntry("META-INF/manifest.xml") is { } manifest)
            {
                using var manifestReader = new StreamReader(manifest.Open());
                if (new string(ReadUpTo(manifestReader, 1 << 20)).Contains("encryption-data", StringComparison.Ordinal))
                {
                    throw new DocumentReadException(QuarantineReason.Encrypted, "the OpenDocument file is password-protected (its manifest lists encryption data)");
                }
            }

            return mime switch
            {
                "application/vnd.oasis.opendocument.text" => (DocumentKind.OpenDocument, ".odt"),
                "application/vnd.oasis.opendocument.spreadsheet" => (DocumentKind.OpenDocument, ".ods"),
                "application/vnd.oasis.opendocument.presentation" => (DocumentKind.OpenDocument, ".odp"),
                "application/vnd.oasis.opendocument.graphics" => (DocumentKind.OpenDocument, ".odg"),
                _ => throw new DocumentReadException(QuarantineReason.Unsupported, $"an OpenDocument package of type '{mime}', which is not read"),
            };
        }

        // ECMA-376 part 2 §10.1.2.4: every OPC package has [Content_Types].xml; the main part names the application.
        if (names.Contains("[Content_Types].xml"))
        {
            if (names.Contains("word/document.xml"))
            {
                return (DocumentKind.OfficeOpenXml, ".docx");
            }

            if (names.Contains("xl/workbook.xml"))
            {
                return (DocumentKind.OfficeOpenXml, ".xlsx");
            }

            if (names.Contains("ppt/presentation.xml"))
            {
                return (DocumentKind.OfficeOpenXml, ".pptx");
            }
        }

        throw new DocumentReadException(QuarantineReason.Unsupported, "a zip archive that is not an Office Open XML or OpenDocument file");
    }

    private static void CheckInflation(ZipArchive archive, ReadLimits limits, CancellationToken cancellationToken)
    {
        // The sizes an entry declares may lie, so every entry is inflated and counted, 64 KiB at a time:
        // a zip bomb is refused here, before the converter would inflate it without a bound.
        var buffer = new byte[1 << 16];
        var total = 0L;
        foreach (var entry in archive.Entries)
        {
            cancellationToken.ThrowIfCancellationRequested();
            if (entry.Length > limits.MaxDecodedBytesPerStream)
            {
                throw TooLarge(entry.FullName, entry.Length, limits);
            }

            try
            {
                using var stream = entry.Open();
                var size = 0L;
                int read;
                while ((read = stream.Read(buffer)) > 0)
                {
                    size += read;
                    total += read;
                    if (size > limits.MaxDecodedBytesPerStream || total > limits.MaxFileBytes)
                    {
                        throw TooLarge(entry.FullName, size, limits);
                    }
                }
            }
            catch (InvalidDataException e)
            {
                throw new DocumentReadException(QuarantineReason.Corrupt, $"the office file's entry '{entry.FullName}' is damaged: {e.Message}", e);
            }
        }
    }

    private static DocumentReadException TooLarge(string entry, long size, ReadLimits limits) => new(
        QuarantineReason.DecodedStreamTooLarge,
        $"the zip entry '{entry}' inflates to more than {Math.Min(size, limits.MaxDecodedBytesPerStream)} bytes (limits: {limits.MaxDecodedBytesPerStream} per entry, {limits.MaxFileBytes} in all)");

    private static char[] ReadUpTo(StreamReader reader, int count)
    {
        var buffer = new char[count];
        var read = reader.ReadBlock(buffer, 0, count);
        return buffer[..read];
    }

    private static bool ContainsUtf16(byte[] file, string name) =>
        file.AsSpan().IndexOf(System.Text.Encoding.Unicode.GetBytes(name + "\0")) >= 0;

    [GeneratedRegex(@"^ppt/slides/slide[0-9]+\.xml$", RegexOptions.CultureInvariant)]
    private static partial Regex SlidePart();
}
