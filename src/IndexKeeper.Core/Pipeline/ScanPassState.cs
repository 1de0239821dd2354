using System.Diagnostics;
using IndexKeeper.Core.Catalog;
using IndexKeeper.Core.Detect;
using IndexKeeper.Core.Diff;
using IndexKeeper.Core.Documents;

namespace IndexKeeper.Core.Pipeline;

/// <summary>Mutable state of one pass; never shared between passes.</summary>
internal sealed class ScanPassState(IndexCatalog catalog, bool dryRun, DateTime startedUtc)
{
    public DateTime StartedUtc { get; } = startedUtc;

    public Stopwatch Stopwatch { get; } = Stopwatch.StartNew();

    /// <summary>Stands in for the pages of a dry run beyond the timing sample.</summary>
    public static PageRecord Placeholder { get; } = new();

    public bool DryRun { get; } = dryRun;

    public ScanSummary Summary { get; } = new();

    /// <summary>Per-document changes, kept only in a dry run (the plan's breakdown).</summary>
    public List<PreviewChange> Changes { get; } = [];

    public void Note(FoundFile file, ChangeKind kind, int pages, int freshPages)
    {
        if (DryRun)
        {
            Changes.Add(new PreviewChange(file.Root, file.RelativePath, kind, freshPages, pages - freshPages));
        }
    }

    public PageLedger Ledger { get; } = new(key => catalog.Pages.Find(key.Hex)?.References);

    public CatalogEdit Edit { get; set; } = new();

    public HashSet<string> Seen { get; } = new(StringComparer.Ordinal);

    private Dictionary<string, Dictionary<string, DocumentRecord>> KnownByRoot { get; } = new(StringComparer.Ordinal);

    /// <summary>
    /// The catalog's document at an id: from the root's documents when a full pass has read them,
    /// else looked up alone (a targeted pass touches a few paths of a large root).
    /// </summary>
    public DocumentRecord? Find(string root, string id)
    {
        if (KnownByRoot.TryGetValue(root, out var known))
        {
            return known.GetValueOrDefault(id);
        }

        if (!SingleLookups.TryGetValue(id, out var document))
        {
            document = catalog.Documents.Find(root, id[(root.Length + 1)..]);
            SingleLookups[id] = document;
        }

        return document;
    }

    private Dictionary<string, DocumentRecord?> SingleLookups { get; } = new(StringComparer.Ordinal);

    /// <summary>
    /// The catalog's documents of a root as they were when the pass began, read once: one lookup
    /// per file costs more than the stat of the quick check. Each document is looked at once per pass.
    /// </summary>
    public Dictionary<string, DocumentRecord> Known(string root)
    {
        if (!KnownByRoot.TryGetValue(root, out var known))
        {
            known = catalog.Documents.OfRoot(root).ToDictionary(d => d.Id, StringComparer.Ordinal);
            KnownByRoot[root] = known;
        }

        return known;
    }

    /// <summary>Paths the walk could not see (permissions, vanished folders): their documents are kept.</summary>
    public List<WalkProblem> Unknown { get; } = [];

    /// <summary>Records a walk problem; true when it means the whole root is missing.</summary>
    public bool Report(WalkProblem problem)
    {
        Summary.Problems.Add($"{problem.Root}/{problem.RelativePath}: {problem.Kind}: {problem.Detail}");
        if (problem.LeavesUnknown)
        {
            Unknown.Add(problem);
        }

        return problem.Kind is WalkProblemKind.RootMissing or WalkProblemKind.RootInaccessible;
    }

    public bool IsUnknown(DocumentRecord document) => Unknown.Any(u =>
        u.Root == document.Root && (u.RelativePath == document.Path || (u.CoversSubtree && (u.RelativePath.Length == 0 || document.Path.StartsWith(u.RelativePath + "/", StringComparison.Ordinal)))));

    /// <summary>A dry run's sample of new pages by kind, for the plan's calibration.</summary>
    public PreviewSampler Sampler { get; } = new();

    /// <summary>Pages first seen in this pass, waiting for the flush that adds them.</summary>
    public Dictionary<PageKey, PageRecord> NewPages { get; } = [];

    /// <summary>Documents written in this pass by file hash, so a second copy in the same batch is not read again.</summary>
    public Dictionary<string, DocumentRecord> KnownHashes { get; } = new(StringComparer.Ordinal);

    public HashSet<string> NewHashes { get; } = new(StringComparer.Ordinal);

    public HashSet<string> DeletedHashes { get; } = new(StringComparer.Ordinal);

    /// <summary>Set when a re-read for this build's readers met a missing program: the pass reads no more documents again for it.</summary>
    public bool RereadsHeld { get; set; }

    /// <summary>Messages of <c>ToolMissing</c> quarantines read again this pass and failing the same way: the rest waiting on them are not read again.</summary>
    public HashSet<string> ToolsStillMissing { get; } = new(StringComparer.Ordinal);

    /// <summary>The installed office converter's version line, asked once per pass when a drawn document needs it ("" when missing or untracked).</summary>
    public string? InstalledConverter { get; set; }

    public bool IsKnownPage(PageKey key) => NewPages.ContainsKey(key) || catalog.Pages.Find(key.Hex) is not null;

    public DocumentRecord? FindCopySource(string hash)
    {
        if (KnownHashes.TryGetValue(hash, out var known))
        {
            return known.State == DocumentState.Live ? known : null;
        }

        return catalog.Documents.LiveWithFileHash(hash).FirstOrDefault();
    }
}
