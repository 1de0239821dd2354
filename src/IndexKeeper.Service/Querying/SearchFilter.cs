using System.Globalization;
using IndexKeeper.Core.Catalog;
using IndexKeeper.Core.Documents;
using Microsoft.Extensions.FileSystemGlobbing;

namespace IndexKeeper.Service.Querying;

/// <summary>
/// Which documents a search may answer from, which hits it keeps, and where its page of hits starts
/// (<c>search --in-root/--in-folder/--type/--modified-since/--min-score/--offset</c>, the same names as
/// parameters of <c>/api/search</c>; docs/search.md, "Filters and paging"). Built by <see cref="Parse"/>, which
/// names every malformed value.
/// </summary>
public sealed record SearchFilter
{
    /// <summary>The largest offset a page of hits may start at: deeper paging ranks too many pages per query.</summary>
    public const int MaxOffset = 10_000;

    // Any absolute path does: the globbing library wants a base folder, matching uses the relative paths.
    private static readonly string MatchBase = Path.GetFullPath(Path.DirectorySeparatorChar.ToString());

    private Matcher? folders;

    public static SearchFilter None { get; } = new();

    /// <summary>Root names; a document of another root is left out.</summary>
    public IReadOnlyList<string> Roots { get; init; } = [];

    /// <summary>Globs over a document's path under its root ('/' separators); a glob naming a folder takes everything below it.</summary>
    public IReadOnlyList<string> Folders { get; init; } = [];

    public IReadOnlyList<DocumentKind> Types { get; init; } = [];

    /// <summary>Documents whose file was last modified at or after this instant (UTC), as the last scan saw it.</summary>
    public DateTime? ModifiedSinceUtc { get; init; }

    /// <summary>Hits below this score are left out.</summary>
    public double? MinimumScore { get; init; }

    /// <summary>Hits of better rank skipped (paging: the next page starts at the report's <c>nextOffset</c>).</summary>
    public int Offset { get; init; }

    /// <summary>True when the filter leaves some documents out (not only scores or offset).</summary>
    public bool SelectsDocuments => Roots.Count > 0 || Folders.Count > 0 || Types.Count > 0 || ModifiedSinceUtc is not null;

    /// <summary>The filter from the values as given, or the first problem, naming the option and the value.</summary>
    public static (SearchFilter? Filter, string? Problem) Parse(
        IReadOnlyList<string> roots, IReadOnlyList<string> folders, IReadOnlyList<string> types, string? modifiedSince, string? minimumScore, string? offset)
    {
        ArgumentNullException.ThrowIfNull(roots);
        ArgumentNullException.ThrowIfNull(folders);
        ArgumentNullException.ThrowIfNull(types);
        var c = CultureInfo.InvariantCulture;
        if (roots.FirstOrDefault(string.IsNullOrWhiteSpace) is not null || folders.FirstOrDefault(string.IsNullOrWhiteSpace) is not null)
        {
            return (null, "root and folder filters need a value; an empty one was given.");
        }

        if (folders.FirstOrDefault(f => f.Split('/').Contains("..") || f.StartsWith('/')) is { } outside)
        {
            return (null, $"folder '{outside}': give a glob relative to the root, such as reports/** (no leading / and no ..).");
        }

        var kinds = new List<DocumentKind>();
        foreach (var type in types)
        {
            if (!Enum.TryParse<DocumentKind>(type, ignoreCase: true, out var kind) || kind == DocumentKind.Unknown || !Enum.IsDefined(kind) || type.Any(char.IsDigit))
            {
                var known = string.Join(", ", Enum.GetValues<DocumentKind>().Where(k => k != DocumentKind.Unknown).Select(k => k.ToString().ToLowerInvariant()));
                return (null, $"type '{type}' is not a document type; give one of {known}.");
            }

            kinds.Add(kind);
        }

        DateTime? since = null;
        if (modifiedSince is not null)
        {
            if (!DateTimeOffset.TryParse(modifiedSince, c, DateTimeStyles.AssumeUniversal, out var parsed) || !LooksIso(modifiedSince))
            {
                return (null, $"modified-since '{modifiedSince}' is not a date; give ISO 8601, such as 2026-11-30 or 2026-11-30T08:00:00Z (UTC unless an offset is given).");
            }

            since = parsed.UtcDateTime;
        }

        double? score = null;
        if (minimumScore is not null)
        {
            if (!double.TryParse(minimumScore, NumberStyles.Float, c, out var value) || !double.IsFinite(value))
            {
                return (null, $"min-score '{minimumScore}' is not a number; give one such as 1.5.");
            }

            score = value;
        }

        var skip = 0;
        if (offset is not null && (!int.TryParse(offset, NumberStyles.None, c, out skip) || skip > MaxOffset))
        {
            return (null, string.Create(c, $"offset '{offset}': give a whole number from 0 to {MaxOffset}."));
        }

        return (new SearchFilter
        {
            Roots = [.. roots.Distinct(StringComparer.Ordinal)],
            Folders = [.. folders],
            Types = kinds,
            ModifiedSinceUtc = since,
            MinimumScore = score,
            Offset = skip,
        }, null);
    }

    /// <summary>Whether a hit may come from <paramref name="document"/>.</summary>
    public bool Admits(DocumentRecord document)
    {
        ArgumentNullException.ThrowIfNull(document);
        return document.State == DocumentState.Live
            && (Roots.Count == 0 || Roots.Contains(document.Root, StringComparer.Ordinal))
            && (Types.Count == 0 || Types.Contains(document.Kind))
            && (ModifiedSinceUtc is not { } since || document.ModifiedTicksUtc >= since.Ticks)
            && (Folders.Count == 0 || FolderMatcher().Match(MatchBase, [document.Path]).HasMatches);
    }

    private Matcher FolderMatcher()
    {
        if (folders is null)
        {
            var matcher = new Matcher(StringComparison.Ordinal);
            foreach (var glob in Folders)
            {
                matcher.AddInclude(glob);
                matcher.AddInclude(glob.TrimEnd('/') + "/**");
            }

            folders = matcher;
        }

        return folders;
    }

    // A date with its year first (2026-11-30, 2026-11-30T08:00Z): other forms the parser takes (11/30/2026) are ambiguous.
    private static bool LooksIso(string text) =>
        text.Length >= 10 && char.IsAsciiDigit(text[0]) && char.IsAsciiDigit(text[3]) && text[4] == '-' && text[7] == '-';
}
