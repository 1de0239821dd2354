namespace IndexKeeper.Core.Encoding;

/// <summary>The Word_Break property of UAX #29; the numbers are those of <see cref="WordBreakTables"/> (never change them).</summary>
internal enum WordBreakProperty
{
    Other = 0,
    CarriageReturn = 1,
    LineFeed = 2,
    Newline = 3,
    Extend = 4,
    ZeroWidthJoiner = 5,
    RegionalIndicator = 6,
    Format = 7,
    Katakana = 8,
    HebrewLetter = 9,
    ALetter = 10,
    SingleQuote = 11,
    DoubleQuote = 12,
    MidNumLet = 13,
    MidLetter = 14,
    MidNum = 15,
    Numeric = 16,
    ExtendNumLet = 17,
    WSegSpace = 18,
}
