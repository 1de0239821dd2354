namespace IndexKeeper.Demo;

/// <summary>
/// One change of the scripted second day, with the truth a scan should find. Paths are '/'-separated
/// and start with the root name ("shared-drive/reports/..."). Every page of the generated store shows
/// something no other page shows (except where a change copies a file), so the page lists below are
/// exactly the page keys that appear and disappear.
/// </summary>
/// <param name="Kind">What kind of change this is.</param>
/// <param name="Description">One line for people, e.g. for the demo's summary.</param>
/// <param name="PathBefore">The file as it was, or null for a new file.</param>
/// <param name="PathAfter">The file as it is now, or null for a deleted file.</param>
/// <param name="PagesNew">1-based pages of <paramref name="PathAfter"/> that show something no page of the store showed before.</param>
/// <param name="PagesGone">1-based pages of <paramref name="PathBefore"/> whose content no page of the store shows any more.</param>
public sealed record DemoChange(
    DemoChangeKind Kind,
    string Description,
    string? PathBefore,
    string? PathAfter,
    IReadOnlyList<int> PagesNew,
    IReadOnlyList<int> PagesGone);
