using IndexKeeper.Cli.Output;

namespace IndexKeeper.Tests.Output;

/// <summary>
/// Escaping for the terminal: ECMA-48 (5th edition, 1991) section 5 puts the C0 set at 00-1F and the C1 set
/// at 80-9F, with DEL at 7F; Unicode UAX #9 (revision 48) section 2 lists the bidirectional formatting
/// characters (ALM U+061C, LRM U+200E, RLM U+200F, LRE..RLO U+202A-U+202E, LRI..PDI U+2066-U+2069).
/// </summary>
public sealed class TerminalTextTests
{
    [Theory]
    [InlineData("plain-name.pdf", "plain-name.pdf")]
    [InlineData("Überlauf Wehr – 2024.pdf", "Überlauf Wehr – 2024.pdf")]
    [InlineData(@"C:\Shares\scans\a.pdf", @"C:\Shares\scans\a.pdf")]
    [InlineData("a\u001b[2Jb", @"a\x1B[2Jb")]
    [InlineData("t\u001b]0;x\u0007", @"t\x1B]0;x\x07")]
    [InlineData("line\nbreak\r\ttab\0", @"line\x0Abreak\x0D\x09tab\x00")]
    [InlineData("del\u007f c1\u0085\u009b", @"del\x7F c1\x85\x9B")]
    [InlineData("bidi\u202egnp.exe", @"bidi\u202Egnp.exe")]
    [InlineData("\u061c\u200e\u200f\u202a\u2066\u2069", @"\u061C\u200E\u200F\u202A\u2066\u2069")]
    [InlineData("", "")]
    public void ControlAndBidiCharactersAreEscapedTheRestKept(string text, string shown) => Assert.Equal(shown, TerminalText.Escape(text));

    [Fact]
    public void EveryC0AndC1CharacterIsEscapedAndNoPrintableOne()
    {
        for (var c = 0; c < 0x300; c++)
        {
            var control = c < 0x20 || c is >= 0x7f and <= 0x9f;
            var shown = TerminalText.Escape(((char)c).ToString());
            Assert.Equal(control ? $"\\x{c:X2}" : ((char)c).ToString(), shown);
        }
    }

    [Fact]
    public void TheWriterEscapesContentButKeepsItsLineEnds()
    {
        using var inner = new StringWriter { NewLine = "\r\n" };
        using var writer = new TerminalSafeWriter(inner);
        writer.WriteLine("one\u001b[31m");
        writer.Write("two\r");
        writer.Write('\u009b');
        writer.WriteLine();
        writer.WriteLine("{0}|{1}", "three\n", 4);
        writer.Write("four\r\n".ToCharArray());
        Assert.Equal("one\\x1B[31m\r\ntwo\\x0D\\x9B\r\nthree\\x0A|4\r\nfour\\x0D\\x0A", inner.ToString());
    }
}
