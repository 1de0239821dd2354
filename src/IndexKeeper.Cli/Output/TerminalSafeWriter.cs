using System.Text;

namespace IndexKeeper.Cli.Output;

/// <summary>
/// Standard output of a command's text answer: everything written is shown as <see cref="TerminalText"/>
/// shows it, except the line ends of WriteLine. So no name from the store can act on the terminal,
/// whichever command prints it. Not used for --json: JSON escapes control characters itself (RFC 8259
/// section 7), and a name stays exact there.
/// </summary>
internal sealed class TerminalSafeWriter(TextWriter inner) : TextWriter(inner.FormatProvider)
{
    public override Encoding Encoding => inner.Encoding;

    [System.Diagnostics.CodeAnalysis.AllowNull]
    public override string NewLine
    {
        get => inner.NewLine;
        set => inner.NewLine = value;
    }

    public override void Write(char value) => inner.Write(TerminalText.Escape(value));

    public override void Write(string? value) => inner.Write(TerminalText.Escape(value));

    /// <summary>The base class ends a line by writing the newline sequence through here: that passes as it is.</summary>
    public override void Write(char[] buffer, int index, int count)
    {
        var text = new string(buffer, index, count);
        if (text == inner.NewLine)
        {
            inner.Write(text);
        }
        else
        {
            inner.Write(TerminalText.Escape(text));
        }
    }

    public override void WriteLine() => inner.WriteLine();

    public override void WriteLine(string? value)
    {
        Write(value);
        inner.WriteLine();
    }

    public override void Flush() => inner.Flush();
}
