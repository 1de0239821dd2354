using System.Buffers;
using UglyToad.PdfPig.Tokens;

namespace IndexKeeper.Core.Documents.Pdf;

/// <summary>
/// Builds the canonical form of one PDF page (docs/page-keys.md, "Page"): the visible box, rotation,
/// user unit and page group, the page's operations, then its visible annotations with appearances.
/// Runs on the raw objects only, before the parser loads the page, so its cycle and size guards
/// protect the parser too. One instance serves one document and shares its hashes across pages.
/// </summary>
internal sealed class PdfPageCanonicalizer
{
    // Annotation flags (ISO 32000-1 §12.5.3, Table 165): Hidden = bit 2, NoView = bit 6.
    private const int HiddenFlag = 1 << 1;
    private const int NoViewFlag = 1 << 5;

    private readonly PdfObjectResolver resolver;
    private readonly PdfObjectHasher hasher;
    private readonly PdfContentWriter content;

    public PdfPageCanonicalizer(PdfObjectResolver resolver, long maxDecodedBytesPerStream, CancellationToken cancellationToken)
    {
        this.resolver = resolver;
        hasher = new PdfObjectHasher(resolver, maxDecodedBytesPerStream, cancellationToken);
        content = new PdfContentWriter(hasher, cancellationToken);
    }

    /// <summary>The canonical bytes of <paramref name="page"/>; their SHA-256 is the page key.</summary>
    public byte[] Canonicalize(PdfPageNode page)
    {
        var writer = new CanonicalWriter();
        writer.Raw(PageKeyFormat.Magic);
        writer.UInt32(PageKeyFormat.Version);
        writer.Byte(PageKeyFormat.PdfPage);

        var box = VisibleBox(page);
        foreach (var edge in new[] { box.Left, box.Bottom, box.Right, box.Top })
        {
            writer.Number(CanonicalNumber.FromDouble(edge));
        }

        writer.Number(CanonicalNumber.FromDouble(NormalRotation(page.Rotate)));
        writer.Number(CanonicalNumber.FromDouble(resolver.Get<NumericToken>(page.Dictionary, "UserUnit")?.Data ?? 1));
        hasher.WriteValue(writer, page.Dictionary.Data.GetValueOrDefault("Group"));

        var (data, damaged) = ReadContents(page.Dictionary);
        writer.Boolean(damaged);
        content.WriteContent(writer, data, ResourceScope.Root(page.Resources));
        WriteAnnotations(writer, page.Dictionary);
        return writer.WrittenSpan.ToArray();
    }

    /// <summary>The crop box clipped to the media box (§14.11.2), in user space; a missing media box is US Letter (common practice).</summary>
    public Rectangle VisibleBox(PdfPageNode page)
    {
        var media = ReadRectangle(page.MediaBox) ?? new Rectangle(0, 0, 612, 792);
        var crop = ReadRectangle(page.CropBox) ?? media;
        var visible = new Rectangle(
            Math.Max(media.Left, crop.Left), Math.Max(media.Bottom, crop.Bottom), Math.Min(media.Right, crop.Right), Math.Min(media.Top, crop.Top));
        return visible.Right > visible.Left && visible.Top > visible.Bottom ? visible : media;
    }

    /// <summary>/Rotate as 0, 90, 180 or 270 (a multiple of 90 by §7.7.3.3; other values are rounded down).</summary>
    public static int NormalRotation(int rotate) => ((rotate / 90 * 90 % 360) + 360) % 360;

    private (byte[] Data, bool Damaged) ReadContents(DictionaryToken page)
    {
        // An array of streams is one stream split at token boundaries (§7.8.2): join with white space.
        var parts = resolver.Get(page, "Contents") switch
        {
            StreamToken single => [single],
            ArrayToken array => array.Data.Select(resolver.Resolve).OfType<StreamToken>().ToList(),
            _ => new List<StreamToken>(),
        };
        var joined = new ArrayBufferWriter<byte>();
        var damaged = false;
        foreach (var part in parts)
        {
            var (data, partDamaged) = hasher.Decode(part, "a page content stream");
            joined.Write(data);
            joined.Write("\n"u8);
            damaged |= partDamaged;
        }

        return (joined.WrittenSpan.ToArray(), damaged);
    }

    private void WriteAnnotations(CanonicalWriter writer, DictionaryToken page)
    {
        foreach (var item in resolver.Get<ArrayToken>(page, "Annots")?.Data ?? [])
        {
            if (resolver.Resolve(item) is not DictionaryToken annotation)
            {
                continue;
            }

            var flags = (int)(resolver.Get<NumericToken>(annotation, "F")?.Data ?? 0);
            if ((flags & (HiddenFlag | NoViewFlag)) != 0 || resolver.Get<NameToken>(annotation, "Subtype")?.Data == "Popup")
            {
                continue;
            }

            if (Appearance(annotation) is not { } appearance || ReadRectangle(resolver.Get<ArrayToken>(annotation, "Rect")) is not { } rect)
            {
                continue;
            }

            // The appearance is drawn into the annotation's rectangle (§12.5.5); nothing else of it shows.
            writer.Byte((byte)'a');
            foreach (var edge in new[] { rect.Left, rect.Bottom, rect.Right, rect.Top })
            {
                writer.Number(CanonicalNumber.FromDouble(edge));
            }

            writer.Hash(content.HashForm(appearance.Reference, appearance.Stream, ResourceScope.Root(null)));
        }

        writer.End();
    }

    /// <summary>The normal appearance (/AP /N), picking the state named by /AS when there are several (§12.5.5).</summary>
    private (UglyToad.PdfPig.Core.IndirectReference? Reference, StreamToken Stream)? Appearance(DictionaryToken annotation)
    {
        if (resolver.Get<DictionaryToken>(annotation, "AP") is not { } appearances
            || !appearances.Data.TryGetValue("N", out var normal))
        {
            return null;
        }

        var resolved = resolver.Resolve(normal);
        if (resolved is DictionaryToken states)
        {
            if (resolver.Get<NameToken>(annotation, "AS") is not { } state || !states.Data.TryGetValue(state.Data, out normal))
            {
                return null;
            }

            resolved = resolver.Resolve(normal);
        }

        return resolved is StreamToken stream ? ((normal as IndirectReferenceToken)?.Data, stream) : null;
    }

    private Rectangle? ReadRectangle(ArrayToken? array)
    {
        if (array is null || array.Data.Count < 4)
        {
            return null;
        }

        var values = new double[4];
        for (var i = 0; i < 4; i++)
        {
            if (resolver.Resolve(array.Data[i]) is not NumericToken number)
            {
                return null;
            }

            values[i] = number.Data;
        }

        // Any two opposite corners may be given (§7.9.5); normalise to lower-left, upper-right.
        return new Rectangle(Math.Min(values[0], values[2]), Math.Min(values[1], values[3]), Math.Max(values[0], values[2]), Math.Max(values[1], values[3]));
    }

    /// <summary>A rectangle in user space, kept in double precision as it was read.</summary>
    public readonly record struct Rectangle(double Left, double Bottom, double Right, double Top);
}
