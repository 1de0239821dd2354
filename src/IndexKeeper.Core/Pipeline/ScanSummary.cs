using IndexKeeper.Core.Detect;
using IndexKeeper.Core.Drift;

namespace IndexKeeper.Core.Pipeline;

/// <summary>
/// What one scan pass found; the field names are the <c>scan --json</c> contract (docs/cli.md).
/// Page figures: <see cref="PagesNew"/> + <see cref="PagesReused"/> = pages of new and changed documents.
/// </summary>
public sealed class ScanSummary
{
    public long DocumentsSeen { get; set; }

    public long DocumentsNew { get; set; }

    public long DocumentsChanged { get; set; }

    public long DocumentsUnchanged { get; set; }

    public long DocumentsDeleted { get; set; }

    /// <summary>New paths whose bytes equal a document deleted in the same pass (renames and moves); counted in new and deleted too.</summary>
    public long DocumentsMoved { get; set; }

    /// <summary>New or changed paths whose bytes equal another live document: their pages were taken without reading.</summary>
    public long DocumentsCopied { get; set; }

    public long DocumentsQuarantined { get; set; }

    /// <summary>Files of a root that could not be opened or hashed in this pass (not quarantined: tried again next pass).</summary>
    public long FilesUnreadable { get; set; }

    /// <summary>Files still being written or changed while read: left for the next pass.</summary>
    public long DocumentsDeferred { get; set; }

    /// <summary>Files of a readable type that the root's include or exclude globs left out.</summary>
    public long FilesSkippedByPattern { get; set; }

    /// <summary>
    /// Files of a type no reader takes (see <see cref="UnsupportedTypes"/>): passed over by the walk, or selected by
    /// an include glob and refused by the reader (those are listed in the quarantine, but are not counted in
    /// <see cref="DocumentsQuarantined"/>, which counts faults).
    /// </summary>
    public long FilesUnsupported { get; set; }

    /// <summary>The unsupported files by type (lower-case extension, or "(none)"), so an operator sees what the drive holds that is not indexed.</summary>
    public SortedDictionary<string, long> UnsupportedTypes { get; } = new(StringComparer.Ordinal);

    public long PagesSeen { get; set; }

    /// <summary>Page keys not seen before: each needs one encoder call.</summary>
    public long PagesNew { get; set; }

    /// <summary>Pages of new or changed documents whose key already existed: no encoder call.</summary>
    public long PagesReused { get; set; }

    /// <summary>Page keys no live document holds any more.</summary>
    public long PagesRemoved { get; set; }

    /// <summary>Encoder page calls made; always 0 for a scan.</summary>
    public long PagesEmbedded { get; set; }

    /// <summary>Pages whose encoder batch failed; they stay queued with a back-off.</summary>
    public long PagesFailed { get; set; }

    public long VectorsWritten { get; set; }

    /// <summary>Wall time spent inside encoder calls.</summary>
    public double EncoderSeconds { get; set; }

    /// <summary>Files hashed (a quick check that failed); files whose quick check passed cost no read.</summary>
    public long FilesHashed { get; set; }

    /// <summary>Documents parsed by the reader.</summary>
    public long DocumentsRead { get; set; }

    /// <summary>Unchanged documents read again: this build's readers give more than the one that read them (<see cref="Documents.ReaderVersion"/>), or another LibreOffice draws them now.</summary>
    public long DocumentsReread { get; set; }

    /// <summary>Wall time inside the reader (parsing, conversion by LibreOffice, OCR), by the kind read; failed reads under "unreadable".</summary>
    public SortedDictionary<string, double> ReadSecondsByKind { get; } = new(StringComparer.Ordinal);

    /// <summary>Wall time inside the reader, all kinds.</summary>
    public double ReadSeconds => ReadSecondsByKind.Values.Sum();

    public double ElapsedSeconds { get; set; }

    /// <summary>The encoder searches rank with after the pass (differs from the active one while migrating).</summary>
    public string ServingEncoderId { get; set; } = string.Empty;

    /// <summary>Declared drift: pages whose live vectors are only under the serving encoder, still to be migrated to the active one.</summary>
    public long PagesDrifted { get; set; }

    /// <summary>Pages of the serving encoder that already have vectors of the active encoder.</summary>
    public long PagesMigrated { get; set; }

    /// <summary>Drifted pages this pass put in the queue at migration priority.</summary>
    public long PagesQueuedForMigration { get; set; }

    /// <summary>The migration completed in this pass and the active encoder now serves.</summary>
    public bool EncoderSwitchedOver { get; set; }

    /// <summary>Configured roots that were not found: their documents were kept, not deleted.</summary>
    public List<string> RootsMissing { get; } = [];

    /// <summary>Entries that could not be looked at (permissions, vanished files, links out of a root).</summary>
    public List<string> Problems { get; } = [];

    /// <summary>Counts a file the walk passed over.</summary>
    public void RecordPassedOver(PassedOverFile file)
    {
        ArgumentNullException.ThrowIfNull(file);
        if (file.ReadableType)
        {
            FilesSkippedByPattern++;
            return;
        }

        FilesUnsupported++;
        var type = ReadableTypes.TypeOf(file.RelativePath);
        UnsupportedTypes[type] = UnsupportedTypes.GetValueOrDefault(type) + 1;
    }

    /// <summary>Adds what a drift reconciliation did; the last one called gives the figures after the pass.</summary>
    public void RecordDrift(DriftDecision decision)
    {
        ArgumentNullException.ThrowIfNull(decision);
        ServingEncoderId = decision.ServingEncoderId;
        PagesDrifted = decision.DriftedPages.Count;
        PagesMigrated = decision.MigratedPages;
        PagesQueuedForMigration += decision.QueueForMigration.Count;
        EncoderSwitchedOver |= decision.SwitchOver;
    }
}
