namespace IndexKeeper.Core.Pipeline;

/// <summary>What a dry-run pass would do with one document.</summary>
public enum ChangeKind
{
    /// <summary>A path the catalog does not know, whose bytes are new: read, its unknown pages embedded.</summary>
    New,

    /// <summary>A known path whose bytes changed: read (or taken from a copy), only its unknown pages embedded.</summary>
    Changed,

    /// <summary>A new path whose bytes equal a live document (a copy or a move): no read, no encoder call.</summary>
    Copied,

    /// <summary>A known path that is gone: its pages lose a reference.</summary>
    Deleted,

    /// <summary>A new or changed file the reader refuses.</summary>
    Quarantined,
}
