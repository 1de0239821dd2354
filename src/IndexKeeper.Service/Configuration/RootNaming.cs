using System.Globalization;
using System.Text.RegularExpressions;

namespace IndexKeeper.Service.Configuration;

/// <summary>
/// A root's name is its identity in the catalog (documents are keyed by root name and relative path), so
/// the folder can move and the roots can be listed in any order without re-indexing. A root given without
/// a name gets one derived from its folder, numbered among earlier roots of the same folder name: the rule
/// every index built before names could be given was made with, so an old configuration reads the same
/// (docs/cli.md, "Root names").
/// </summary>
public static partial class RootNaming
{
    /// <summary>Letters, digits, '-', '_' and '.', 1 to 64 of them.</summary>
    public static bool IsAllowed(string name) => Allowed().IsMatch(name);

    /// <summary>
    /// A <c>--root</c> value: <c>NAME=DIR</c> when the text before the first '=' is an allowed name and a
    /// folder follows; otherwise the whole value is the folder (a relative folder whose own name holds '='
    /// is written <c>./a=b</c>).
    /// </summary>
    public static (string? Name, string Path) Split(string value)
    {
        ArgumentNullException.ThrowIfNull(value);
        var equals = value.IndexOf('=', StringComparison.Ordinal);
        return equals > 0 && equals < value.Length - 1 && IsAllowed(value[..equals]) ? (value[..equals], value[(equals + 1)..]) : (null, value);
    }

    /// <summary>The name derived from the folder of root <paramref name="index"/> of <paramref name="paths"/>.</summary>
    public static string Derived(IReadOnlyList<string> paths, int index)
    {
        ArgumentNullException.ThrowIfNull(paths);
        var name = FolderName(paths[index]);
        var earlier = Enumerable.Range(0, index).Count(i => FolderName(paths[i]) == name);
        return earlier == 0 ? name : string.Create(CultureInfo.InvariantCulture, $"{name}-{earlier + 1}");
    }

    private static string FolderName(string path)
    {
        if (string.IsNullOrWhiteSpace(path))
        {
            return "root";
        }

        var name = System.IO.Path.GetFileName(System.IO.Path.TrimEndingDirectorySeparator(System.IO.Path.GetFullPath(path)));
        var cleaned = new string(name.Select(c => char.IsAsciiLetterOrDigit(c) || c is '-' or '_' or '.' ? c : '-').ToArray());
        return cleaned.Length is > 0 and <= 48 ? cleaned : "root";
    }

    [GeneratedRegex("^[A-Za-z0-9._-]{1,64}$")]
    private static partial Regex Allowed();
}
