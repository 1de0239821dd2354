using TextEncoding = System.Text.Encoding;
using UglyToad.PdfPig.Core;
using UglyToad.PdfPig.Tokens;

namespace IndexKeeper.Core.Documents.Pdf;

/// <summary>
/// Writes the canonical operations of a content stream (docs/page-keys.md, "Content"): resources named by
/// the operators replaced by content hashes, form XObjects followed recursively (cycle-checked), inline
/// and XObject images as one kind of record, marked content dropped unless it is optional content, and
/// any save/restore pair around the whole stream stripped. One instance serves one document.
/// </summary>
internal sealed class PdfContentWriter
{
    // Layers of q … Q around a whole stream that are stripped; more only come from hostile files.
    private const int MaxOuterSaveLayers = 8;

    private static readonly IReadOnlySet<string> ImageExcluded = Union(PdfObjectHasher.ExcludedKeys, "Type", "Subtype", "Name");

    private static readonly IReadOnlySet<string> FormExcluded = Union(
        PdfObjectHasher.ExcludedKeys, "Type", "Subtype", "Name", "FormType", "Resources", "Filter", "DecodeParms", "F", "DP");

    private static readonly HashSet<string> DeviceColourSpaces = new(StringComparer.Ordinal) { "DeviceGray", "DeviceRGB", "DeviceCMYK", "Pattern" };

    private readonly PdfObjectHasher hasher;
    private readonly PdfObjectResolver resolver;
    private readonly FormGraphCheck forms = new();
    private readonly Dictionary<IndirectReference, byte[]> formMemo = [];
    private readonly Dictionary<IndirectReference, byte[]> imageMemo = [];
    private readonly HashSet<DictionaryToken> fontsChecked = new(ReferenceEqualityComparer.Instance);
    private readonly CancellationToken cancellationToken;
    private int lowestLevelUsed = int.MaxValue;

    public PdfContentWriter(PdfObjectHasher hasher, CancellationToken cancellationToken)
    {
        this.hasher = hasher;
        resolver = hasher.Resolver;
        this.cancellationToken = cancellationToken;
    }

    /// <summary>Writes the operations of <paramref name="content"/> (decoded bytes) seen through <paramref name="scope"/>, then an end tag.</summary>
    public void WriteContent(CanonicalWriter writer, ReadOnlySpan<byte> content, ResourceScope scope)
    {
        CheckFonts(scope.Resources);
        var operations = ContentLexer.Parse(content, cancellationToken);
        var (start, end) = StripOuterSave(operations);
        var markedContent = new Stack<bool>();
        for (var i = start; i < end; i++)
        {
            WriteOperation(writer, operations[i], scope, markedContent);
        }

        writer.End();
    }

    /// <summary>The hash of a form XObject drawn from <paramref name="scope"/> (also used for annotation appearances).</summary>
    public byte[] HashForm(IndirectReference? reference, StreamToken form, ResourceScope scope)
    {
        if (reference is { } r)
        {
            forms.Enter(r);
        }

        try
        {
            if (reference is { } known && formMemo.TryGetValue(known, out var memoHash))
            {
                return memoHash;
            }

            var formResources = resolver.Get<DictionaryToken>(form.StreamDictionary, "Resources");
            var inner = scope.Inner(formResources);
            var outerLowest = lowestLevelUsed;
            lowestLevelUsed = int.MaxValue;
            var writer = new CanonicalWriter();
            writer.Byte((byte)'F');
            hasher.WriteDictionaryBody(writer, form.StreamDictionary, FormExcluded);
            var (data, damaged) = hasher.Decode(form, "a form XObject");
            writer.Boolean(damaged);
            WriteContent(writer, data, inner);
            var hash = writer.Sha256();

            // A form that found every name in its own resources hashes the same wherever it is drawn.
            if (reference is { } self && formResources is not null && lowestLevelUsed >= inner.Level)
            {
                formMemo[self] = hash;
            }

            lowestLevelUsed = Math.Min(outerLowest, lowestLevelUsed);
            return hash;
        }
        finally
        {
            if (reference is { } r2)
            {
                forms.Exit(r2);
            }
        }
    }

    private void WriteOperation(CanonicalWriter writer, ContentOperation operation, ResourceScope scope, Stack<bool> markedContent)
    {
        var operands = operation.Operands;
        switch (operation.Operator)
        {
            case "BMC":
                markedContent.Push(false);
                return;
            case "BDC" when operands is [ContentValue.Name { Value: "OC" }, ContentValue.Name properties]:
                // Optional content decides visibility (§8.11.3.2); other marked content never shows.
                markedContent.Push(true);
                WriteOperator(writer, "BDC", 2);
                WriteOperand(writer, operands[0]);
                WriteResource(writer, scope, "Properties", properties.Value);
                return;
            case "BDC":
                markedContent.Push(false);
                return;
            case "EMC":
                if (markedContent.Count > 0 && markedContent.Pop())
                {
                    WriteOperator(writer, "EMC", 0);
                }

                return;
            case "MP" or "DP":
                return;
            case "BI" when operation.ImageDictionary is { } image:
                var stream = InlineImageNames.ToStream(image, operation.ImageData ?? [], name => scope.Find(resolver, "ColorSpace", name).Value);
                WriteOperator(writer, "image", 1);
                writer.Hash(hasher.HashStream(stream, ImageExcluded, "an inline image"));
                return;
            case "Do" when operands is [ContentValue.Name xObject]:
                WriteXObject(writer, scope, xObject.Value);
                return;
            case "Tf" when operands is [ContentValue.Name font, ..]:
                WriteOperator(writer, "Tf", operands.Count);
                WriteResource(writer, scope, "Font", font.Value);
                WriteOperands(writer, operands.Skip(1));
                return;
            case "gs" when operands is [ContentValue.Name state]:
                WriteOperator(writer, "gs", 1);
                WriteResource(writer, scope, "ExtGState", state.Value);
                return;
            case "sh" when operands is [ContentValue.Name shading]:
                WriteOperator(writer, "sh", 1);
                WriteResource(writer, scope, "Shading", shading.Value);
                return;
            case "cs" or "CS" when operands is [ContentValue.Name space] && !DeviceColourSpaces.Contains(space.Value):
                WriteOperator(writer, operation.Operator, 1);
                WriteResource(writer, scope, "ColorSpace", space.Value);
                return;
            case "scn" or "SCN" when operands is [.., ContentValue.Name pattern]:
                WriteOperator(writer, operation.Operator, operands.Count);
                WriteOperands(writer, operands.Take(operands.Count - 1));
                WriteResource(writer, scope, "Pattern", pattern.Value);
                return;
        }

        WriteOperator(writer, operation.Operator, operands.Count);
        WriteOperands(writer, operands);
    }

    private void WriteXObject(CanonicalWriter writer, ResourceScope scope, string name)
    {
        var (value, level) = scope.Find(resolver, "XObject", name);
        Used(level);
        var reference = (value as IndirectReferenceToken)?.Data;
        if (resolver.Resolve(value) is not StreamToken stream)
        {
            WriteOperator(writer, "Do", 1);
            writer.Tagged(CanonicalWriter.MissingResourceTag, TextEncoding.UTF8.GetBytes("XObject/" + name));
            return;
        }

        switch (resolver.Get<NameToken>(stream.StreamDictionary, "Subtype")?.Data)
        {
            case "Image":
                WriteOperator(writer, "image", 1);
                writer.Hash(HashImage(reference, stream));
                break;
            case "Form":
                WriteOperator(writer, "form", 1);
                writer.Hash(HashForm(reference, stream, scope));
                break;
            default:
                WriteOperator(writer, "Do", 1);
                writer.Hash(hasher.HashOf(value));
                break;
        }
    }

    private byte[] HashImage(IndirectReference? reference, StreamToken image)
    {
        if (reference is { } known && imageMemo.TryGetValue(known, out var hash))
        {
            return hash;
        }

        hash = hasher.HashStream(image, ImageExcluded, "an image XObject");
        if (reference is { } r)
        {
            imageMemo[r] = hash;
        }

        return hash;
    }

    private void WriteResource(CanonicalWriter writer, ResourceScope scope, string category, string name)
    {
        var (value, level) = scope.Find(resolver, category, name);
        Used(level);
        if (value is null)
        {
            writer.Tagged(CanonicalWriter.MissingResourceTag, TextEncoding.UTF8.GetBytes(category + "/" + name));
            return;
        }

        writer.Byte(CanonicalWriter.ResourceTag);
        writer.Raw(hasher.HashOf(value));
    }

    // Fonts the parser loads with a resource dictionary are decoded under the cap even when unused;
    // only the fonts an operator names reach the key.
    private void CheckFonts(DictionaryToken? resources)
    {
        if (resolver.Get<DictionaryToken>(resources, "Font") is { } fonts && fontsChecked.Add(fonts))
        {
            foreach (var font in fonts.Data.Values)
            {
                hasher.HashOf(font);
            }
        }
    }

    private void Used(int level)
    {
        if (level >= 0)
        {
            lowestLevelUsed = Math.Min(lowestLevelUsed, level);
        }
    }

    private static void WriteOperator(CanonicalWriter writer, string name, int operandCount)
    {
        writer.Byte(CanonicalWriter.OperationTag);
        writer.Keyword(TextEncoding.Latin1.GetBytes(name));
        writer.UInt32((uint)operandCount);
    }

    private static void WriteOperands(CanonicalWriter writer, IEnumerable<ContentValue> operands)
    {
        foreach (var operand in operands)
        {
            WriteOperand(writer, operand);
        }
    }

    private static void WriteOperand(CanonicalWriter writer, ContentValue value)
    {
        switch (value)
        {
            case ContentValue.Number number:
                writer.Number(number.Canonical);
                break;
            case ContentValue.Text text:
                writer.String(text.Bytes);
                break;
            case ContentValue.Name name:
                writer.Name(name.Value);
                break;
            case ContentValue.Boolean boolean:
                writer.Boolean(boolean.Value);
                break;
            case ContentValue.Keyword keyword:
                writer.Keyword(TextEncoding.Latin1.GetBytes(keyword.Value));
                break;
            case ContentValue.Array array:
                writer.Byte(CanonicalWriter.ArrayTag);
                writer.UInt32((uint)array.Items.Count);
                WriteOperands(writer, array.Items);
                break;
            case ContentValue.Dictionary dictionary:
                var entries = dictionary.Entries.OrderBy(e => e.Key, StringComparer.Ordinal).ToList();
                writer.Byte(CanonicalWriter.DictionaryTag);
                writer.UInt32((uint)entries.Count);
                foreach (var (key, entry) in entries)
                {
                    writer.Name(key);
                    WriteOperand(writer, entry);
                }

                break;
            default:
                writer.Null();
                break;
        }
    }

    /// <summary>
    /// The range of <paramref name="operations"/> inside any q … Q pairs that enclose all of it: such a
    /// pair changes nothing on the page, and rewriting tools add one.
    /// </summary>
    private static (int Start, int End) StripOuterSave(List<ContentOperation> operations)
    {
        var start = 0;
        var end = operations.Count;
        for (var layer = 0; layer < MaxOuterSaveLayers && end - start >= 2; layer++)
        {
            if (operations[start].Operator != "q" || operations[end - 1].Operator != "Q")
            {
                break;
            }

            var depth = 1;
            for (var i = start + 1; i < end - 1 && depth > 0; i++)
            {
                depth += operations[i].Operator switch { "q" => 1, "Q" => -1, _ => 0 };
            }

            if (depth != 1)
            {
                break;
            }

            start++;
            end--;
        }

        return (start, end);
    }

    private static HashSet<string> Union(IReadOnlySet<string> set, params string[] more)
    {
        var union = new HashSet<string>(set, StringComparer.Ordinal);
        union.UnionWith(more);
        return union;
    }
}
