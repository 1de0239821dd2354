using TextEncoding = System.Text.Encoding;

namespace IndexKeeper.Core.Documents.Pdf;

/// <summary>
/// Splits decoded content-stream bytes into operations (ISO 32000-1 §7.2 lexical conventions, §7.8.2
/// content streams, §8.9.7 inline images). White space, comments and the way strings are written do not
/// survive: only the values and operators do.
/// </summary>
internal static class ContentLexer
{
    // Arrays or dictionaries nested deeper than this only come from hostile files.
    private const int MaxNesting = 200;

    public static List<ContentOperation> Parse(ReadOnlySpan<byte> data, CancellationToken cancellationToken)
    {
        var operations = new List<ContentOperation>();
        var operands = new List<ContentValue>();
        var position = 0;
        while (ReadObject(data, ref position, 0) is { } value)
        {
            if ((operations.Count & 1023) == 0)
            {
                cancellationToken.ThrowIfCancellationRequested();
            }

            if (value is not ContentValue.Keyword keyword)
            {
                operands.Add(value);
                continue;
            }

            operations.Add(keyword.Value == "BI" ? ReadInlineImage(data, ref position) : new ContentOperation(keyword.Value, operands.ToArray()));
            operands.Clear();
        }

        return operations;
    }

    /// <summary>The next value, or a bare word as <see cref="ContentValue.Keyword"/>; null at the end of the data.</summary>
    private static ContentValue? ReadObject(ReadOnlySpan<byte> data, ref int position, int depth)
    {
        while (true)
        {
            SkipWhiteSpaceAndComments(data, ref position);
            if (position >= data.Length)
            {
                return null;
            }

            var b = data[position];
            switch (b)
            {
                case (byte)'(':
                    return new ContentValue.Text(ReadLiteralString(data, ref position));
                case (byte)'<' when position + 1 < data.Length && data[position + 1] == (byte)'<':
                    position += 2;
                    return ToDictionary(ReadItems(data, ref position, depth, isDictionary: true));
                case (byte)'<':
                    return new ContentValue.Text(ReadHexString(data, ref position));
                case (byte)'[':
                    position++;
                    return new ContentValue.Array(ReadItems(data, ref position, depth, isDictionary: false));
                case (byte)'/':
                    return new ContentValue.Name(ReadName(data, ref position));
                case (byte)'>' or (byte)')' or (byte)'{' or (byte)'}' or (byte)']':
                    // Stray delimiters carry nothing a reader could draw.
                    position++;
                    continue;
            }

            var word = ReadRegular(data, ref position);
            if (CanonicalNumber.FromPdfText(word) is { } number)
            {
                return new ContentValue.Number(number);
            }

            var keyword = TextEncoding.Latin1.GetString(word);
            return keyword switch
            {
                "true" => new ContentValue.Boolean(true),
                "false" => new ContentValue.Boolean(false),
                "null" => new ContentValue.Null(),
                _ => new ContentValue.Keyword(keyword),
            };
        }
    }

    private static List<ContentValue> ReadItems(ReadOnlySpan<byte> data, ref int position, int depth, bool isDictionary)
    {
        if (depth == MaxNesting)
        {
            throw new DocumentReadException(QuarantineReason.Corrupt, $"content operands nested more than {MaxNesting} deep");
        }

        var items = new List<ContentValue>();
        while (true)
        {
            SkipWhiteSpaceAndComments(data, ref position);
            if (position >= data.Length)
            {
                return items;
            }

            if (!isDictionary && data[position] == (byte)']')
            {
                position++;
                return items;
            }

            if (isDictionary && data[position] == (byte)'>' && position + 1 < data.Length && data[position + 1] == (byte)'>')
            {
                position += 2;
                return items;
            }

            if (ReadObject(data, ref position, depth + 1) is { } item)
            {
                items.Add(item);
            }
        }
    }

    public static bool IsWhiteSpace(byte b) => b is 0 or 9 or 10 or 12 or 13 or 32;

    private static bool IsDelimiter(byte b) => b is (byte)'(' or (byte)')' or (byte)'<' or (byte)'>' or (byte)'[' or (byte)']' or (byte)'{' or (byte)'}' or (byte)'/' or (byte)'%';

    private static void SkipWhiteSpaceAndComments(ReadOnlySpan<byte> data, ref int position)
    {
        while (position < data.Length)
        {
            if (IsWhiteSpace(data[position]))
            {
                position++;
            }
            else if (data[position] == (byte)'%')
            {
                while (position < data.Length && data[position] is not (10 or 13))
                {
                    position++;
                }
            }
            else
            {
                return;
            }
        }
    }

    private static ReadOnlySpan<byte> ReadRegular(ReadOnlySpan<byte> data, ref int position)
    {
        var start = position;
        while (position < data.Length && !IsWhiteSpace(data[position]) && !IsDelimiter(data[position]))
        {
            position++;
        }

        return data[start..position];
    }

    private static string ReadName(ReadOnlySpan<byte> data, ref int position)
    {
        position++; // '/'
        var raw = ReadRegular(data, ref position);
        var bytes = new List<byte>(raw.Length);
        for (var i = 0; i < raw.Length; i++)
        {
            // #xx is a byte written in hex (§7.3.5).
            if (raw[i] == (byte)'#' && i + 2 < raw.Length && IsHex(raw[i + 1]) && IsHex(raw[i + 2]))
            {
                bytes.Add((byte)((HexValue(raw[i + 1]) << 4) | HexValue(raw[i + 2])));
                i += 2;
            }
            else
            {
                bytes.Add(raw[i]);
            }
        }

        return TextEncoding.UTF8.GetString(bytes.ToArray());
    }

    private static byte[] ReadLiteralString(ReadOnlySpan<byte> data, ref int position)
    {
        position++; // '('
        var bytes = new List<byte>();
        var depth = 1;
        while (position < data.Length)
        {
            var b = data[position++];
            switch (b)
            {
                case (byte)'(':
                    depth++;
                    bytes.Add(b);
                    break;
                case (byte)')':
                    if (--depth == 0)
                    {
                        return bytes.ToArray();
                    }

                    bytes.Add(b);
                    break;
                case 13:
                    // An unescaped end-of-line in a literal string is one line feed (§7.3.4.2).
                    if (position < data.Length && data[position] == 10)
                    {
                        position++;
                    }

                    bytes.Add(10);
                    break;
                case (byte)'\\':
                    ReadEscape(data, ref position, bytes);
                    break;
                default:
                    bytes.Add(b);
                    break;
            }
        }

        return bytes.ToArray();
    }

    private static void ReadEscape(ReadOnlySpan<byte> data, ref int position, List<byte> bytes)
    {
        if (position >= data.Length)
        {
            return;
        }

        var e = data[position++];
        switch (e)
        {
            case (byte)'n': bytes.Add(10); break;
            case (byte)'r': bytes.Add(13); break;
            case (byte)'t': bytes.Add(9); break;
            case (byte)'b': bytes.Add(8); break;
            case (byte)'f': bytes.Add(12); break;
            case 13:
                // Backslash + end-of-line continues the string on the next line.
                if (position < data.Length && data[position] == 10)
                {
                    position++;
                }

                break;
            case 10:
                break;
            case >= (byte)'0' and <= (byte)'7':
                var value = e - '0';
                for (var digits = 1; digits < 3 && position < data.Length && data[position] is >= (byte)'0' and <= (byte)'7'; digits++)
                {
                    value = (value * 8) + (data[position++] - '0');
                }

                bytes.Add((byte)value);
                break;
            default:
                // \( \) \\ stand for themselves; an unknown escape drops the backslash (§7.3.4.2).
                bytes.Add(e);
                break;
        }
    }

    private static byte[] ReadHexString(ReadOnlySpan<byte> data, ref int position)
    {
        position++; // '<'
        var bytes = new List<byte>();
        var high = -1;
        while (position < data.Length && data[position] != (byte)'>')
        {
            var b = data[position++];
            if (!IsHex(b))
            {
                continue;
            }

            if (high < 0)
            {
                high = HexValue(b);
            }
            else
            {
                bytes.Add((byte)((high << 4) | HexValue(b)));
                high = -1;
            }
        }

        position++; // '>'
        if (high >= 0)
        {
            bytes.Add((byte)(high << 4)); // an odd final digit is followed by 0 (§7.3.4.3)
        }

        return bytes.ToArray();
    }

    private static ContentOperation ReadInlineImage(ReadOnlySpan<byte> data, ref int position)
    {
        // Key-value pairs up to the ID keyword (§8.9.7).
        var items = new List<ContentValue>();
        while (ReadObject(data, ref position, 0) is { } item && item is not ContentValue.Keyword { Value: "ID" })
        {
            items.Add(item);
        }

        var dictionary = ToDictionary(items);
        if (position < data.Length && IsWhiteSpace(data[position]))
        {
            position++; // the single white-space byte after ID
        }

        var dataStart = position;
        var length = InlineImageNames.UnfilteredLength(dictionary);
        int dataEnd;
        if (length is { } known && dataStart + known <= data.Length && EndsWithEi(data, dataStart + known))
        {
            dataEnd = dataStart + (int)known;
            position = dataEnd;
        }
        else
        {
            // Filtered data: the image ends at the first "EI" set off by white space (common practice).
            position = dataStart;
            while (position + 1 < data.Length && !IsEiAt(data, position))
            {
                position++;
            }

            dataEnd = position > dataStart && IsWhiteSpace(data[position - 1]) ? position - 1 : position;
            if (position + 1 >= data.Length)
            {
                dataEnd = data.Length;
            }
        }

        var imageData = data[dataStart..Math.Max(dataStart, dataEnd)].ToArray();
        SkipWhiteSpaceAndComments(data, ref position);
        if (position + 1 < data.Length && data[position] == (byte)'E' && data[position + 1] == (byte)'I')
        {
            position += 2;
        }
        else
        {
            position = data.Length;
        }

        return new ContentOperation("BI", [], dictionary, imageData);
    }

    private static bool EndsWithEi(ReadOnlySpan<byte> data, long end)
    {
        var p = (int)end;
        while (p < data.Length && IsWhiteSpace(data[p]))
        {
            p++;
        }

        return p + 1 < data.Length ? data[p] == (byte)'E' && data[p + 1] == (byte)'I' : p >= data.Length;
    }

    private static bool IsEiAt(ReadOnlySpan<byte> data, int p) =>
        data[p] == (byte)'E' && data[p + 1] == (byte)'I'
        && (p == 0 || IsWhiteSpace(data[p - 1]))
        && (p + 2 >= data.Length || IsWhiteSpace(data[p + 2]) || IsDelimiter(data[p + 2]));

    private static ContentValue.Dictionary ToDictionary(List<ContentValue> items)
    {
        var entries = new List<KeyValuePair<string, ContentValue>>(items.Count / 2);
        for (var i = 0; i + 1 < items.Count; i += 2)
        {
            if (items[i] is ContentValue.Name key)
            {
                entries.Add(new(key.Value, items[i + 1]));
            }
        }

        return new ContentValue.Dictionary(entries);
    }

    private static bool IsHex(byte b) => b is >= (byte)'0' and <= (byte)'9' or >= (byte)'a' and <= (byte)'f' or >= (byte)'A' and <= (byte)'F';

    private static int HexValue(byte b) => b <= (byte)'9' ? b - '0' : (b | 0x20) - 'a' + 10;
}
