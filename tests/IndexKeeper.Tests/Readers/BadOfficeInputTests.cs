using System.IO.Compression;
using IndexKeeper.Core.Documents;
using IndexKeeper.Tests.Documents;

namespace IndexKeeper.Tests.Readers;

/// <summary>Hostile and broken office files: each is quarantined with a reason, none reaches a crash.</summary>
public sealed class BadOfficeInputTests : IDisposable
{
    private readonly TempFolder folder = new();

    [Fact]
    public void A_truncated_docx_is_corrupt()
    {
        var whole = OfficeSamples.Letter("A", DateTime.UnixEpoch);
        var failure = folder.ReadFails(whole[..(whole.Length / 2)]);
        Assert.Equal(QuarantineReason.Corrupt, failure.Reason);
    }

    [Fact]
    public void A_zip_bomb_inside_a_docx_is_refused_before_conversion()
    {
        // 64 MiB of zeros deflate to about 64 KiB: a ratio of 1000 (DEFLATE, RFC 1951, from memory).
        var bomb = Zip(
            ("[Content_Types].xml", "<Types xmlns=\"http://schemas.openxmlformats.org/package/2006/content-types\"/>"u8.ToArray()),
            ("word/document.xml", new byte[64 << 20]));
        var limits = ReadLimits.Default with { MaxDecodedBytesPerStream = 8 << 20 };
        var failure = folder.ReadFails(bomb, limits);
        Assert.Equal(QuarantineReason.DecodedStreamTooLarge, failure.Reason);
        Assert.Contains("word/document.xml", failure.Message, StringComparison.Ordinal);
    }

    [Fact]
    public void A_password_protected_opendocument_is_encrypted()
    {
        // OpenDocument 1.3 part 3 §4.8: an encrypted entry is listed with manifest:encryption-data.
        var odt = Zip(
            ("mimetype", "application/vnd.oasis.opendocument.text"u8.ToArray()),
            ("META-INF/manifest.xml", """
                <manifest:manifest xmlns:manifest="urn:oasis:names:tc:opendocument:xmlns:manifest:1.0">
                 <manifest:file-entry manifest:full-path="content.xml" manifest:media-type="text/xml">
                  <manifest:encryption-data manifest:checksum-type="SHA1/1K" manifest:checksum="AAAA"/>
                 </manifest:file-entry>
                </manifest:manifest>
                """u8.ToArray()),
            ("content.xml", Random.Shared.GetItems<byte>(new byte[256], 4096)));
        Assert.Equal(QuarantineReason.Encrypted, folder.ReadFails(odt).Reason);
    }

    [Fact]
    public void A_password_protected_office_open_xml_file_is_encrypted()
    {
        // [MS-OFFCRYPTO] §2.3.4.4: an encrypted OOXML file is an OLE2 compound file ([MS-CFB] signature
        // D0 CF 11 E0 A1 B1 1A E1) holding an "EncryptedPackage" stream; its name is UTF-16LE in the directory.
        Assert.Equal(QuarantineReason.Encrypted, folder.ReadFails(Compound("EncryptedPackage")).Reason);
    }

    [Fact]
    public void A_damaged_legacy_word_file_fails_conversion()
    {
        var failure = folder.ReadFails(Compound("WordDocument"));
        Assert.Equal(QuarantineReason.ConversionFailed, failure.Reason);
        Assert.Contains("doc", failure.Message, StringComparison.Ordinal);
    }

    [Fact]
    public void A_deck_of_2000_slides_is_refused_before_conversion()
    {
        var limits = ReadLimits.Default with { MaxPages = 1000 };
        var failure = folder.ReadFails(OfficeSamples.Deck(2000), limits);
        Assert.Equal(QuarantineReason.TooManyPages, failure.Reason);
        Assert.Contains("2000 slides", failure.Message, StringComparison.Ordinal);
    }

    [Fact]
    public void A_plain_zip_archive_is_unsupported()
    {
        Assert.Equal(QuarantineReason.Unsupported, folder.ReadFails(Zip(("notes.txt", "tide tables"u8.ToArray()))).Reason);
    }

    public void Dispose() => folder.Dispose();

    /// <summary>Not a valid compound file: its signature and one UTF-16LE stream name, the rest zeros.</summary>
    private static byte[] Compound(string streamName)
    {
        var file = new byte[8192];
        new byte[] { 0xD0, 0xCF, 0x11, 0xE0, 0xA1, 0xB1, 0x1A, 0xE1 }.CopyTo(file, 0);
        System.Text.Encoding.Unicode.GetBytes(streamName + "\0").CopyTo(file, 1024);
        return file;
    }

    private static byte[] Zip(params (string Name, byte[] Data)[] entries)
    {
        using var stream = new MemoryStream();
        using (var archive = new ZipArchive(stream, ZipArchiveMode.Create, leaveOpen: true))
        {
            foreach (var (name, data) in entries)
            {
                using var entry = archive.CreateEntry(name, CompressionLevel.SmallestSize).Open();
                entry.Write(data);
            }
        }

        return stream.ToArray();
    }
}
