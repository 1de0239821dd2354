using System.Globalization;

namespace IndexKeeper.Core.Encoding;

/// <summary>Range tables of the pinned Unicode data (<see cref="UnicodeTables"/>, <see cref="WordBreakTables"/>): parsed once, searched by code point.</summary>
internal static class UnicodeRanges
{
    /// <summary>"first[-last][:value]" hex entries separated by ';'; a missing value means 1. Sorted, not overlapping.</summary>
    public static (int First, int Last, int Value)[] Parse(string table) =>
        table.Split(';', StringSplitOptions.RemoveEmptyEntries).Select(e =>
        {
            var parts = e.Split(':');
            var range = parts[0].Split('-');
            return (Hex(range[0]), Hex(range[^1]), parts.Length > 1 ? Hex(parts[1]) : 1);
        }).ToArray();

    /// <summary>The value of the range holding <paramref name="codePoint"/>; 0 when none does.</summary>
    public static int Lookup((int First, int Last, int Value)[] ranges, int codePoint)
    {
        int low = 0, high = ranges.Length - 1;
        while (low <= high)
        {
            var middle = (low + high) >>> 1;
            if (codePoint < ranges[middle].First)
            {
                high = middle - 1;
            }
            else if (codePoint > ranges[middle].Last)
            {
                low = middle + 1;
            }
            else
            {
                return ranges[middle].Value;
            }
        }

        return 0;
    }

    public static int Hex(string text) => int.Parse(text, NumberStyles.HexNumber, CultureInfo.InvariantCulture);
}
