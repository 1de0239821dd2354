using System.Text;

namespace IndexKeeper.Core.Documents;

/// <summary>
/// A document's own title as hits show it: white space (control characters included) collapsed to single
/// spaces, trimmed, at most <see cref="MaxLength"/> characters; null when nothing is left. A title is
/// the file's own words, so it never carries terminal control codes into a listing.
/// </summary>
public static class DocumentTitle
{
    public const int MaxLength = 300;

    public static string? Clean(string? title)
    {
        if (string.IsNullOrWhiteSpace(title))
        {
            return null;
        }

        var cleaned = new StringBuilder(Math.Min(title.Length, MaxLength));
        var space = false;
        foreach (var c in title)
        {
            if (char.IsWhiteSpace(c) || char.IsControl(c))
            {
                space = cleaned.Length > 0;
                continue;
            }

            if (cleaned.Length + (space ? 2 : 1) > MaxLength)
            {
                break;
            }

            if (space)
            {
                cleaned.Append(' ');
                space = false;
            }

            cleaned.Append(c);
        }

        return cleaned.Length == 0 ? null : cleaned.ToString();
    }
}
