namespace IndexKeeper.Core.Detect;

/// <summary>The quick check's answer before any byte is read.</summary>
public enum QuickCheckVerdict
{
    /// <summary>Same size, time and identity, stat not racy, hash known: the stored page keys stand.</summary>
    Unchanged,

    NeedsHash,
}
