using System.Globalization;
using System.Text;
using IndexKeeper.Core.Documents;

namespace IndexKeeper.Tests.Isolation;

/// <summary>
/// What a read ended in, as comparable text: the whole content (kind, every page field, every word and
/// box) or the refusal's reason and message. Lets a test hold the isolated reader to the in-process one.
/// </summary>
internal static class ReadOutcome
{
    public static string Of(Func<DocumentContent> read)
    {
        try
        {
            return Describe(read());
        }
        catch (DocumentReadException e)
        {
            return $"refused {e.Reason}: {e.Message}";
        }
    }

    public static string Describe(DocumentContent content)
    {
        var text = new StringBuilder().Append(content.Kind).Append(" pages=").Append(content.Pages.Count).Append(" title=").Append(content.Title ?? "(none)").AppendLine();
        foreach (var page in content.Pages)
        {
            text.Append(CultureInfo.InvariantCulture, $"{page.Number} {page.Key} {page.Width:R}x{page.Height:R} r{page.Rotation}:");
            foreach (var word in page.Words)
            {
                text.Append(CultureInfo.InvariantCulture, $" '{word.Text}'@{word.Box.Left:R},{word.Box.Bottom:R},{word.Box.Right:R},{word.Box.Top:R}");
            }

            text.AppendLine();
        }

        return text.ToString();
    }
}
