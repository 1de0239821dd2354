namespace IndexKeeper.Core.Detect;

/// <summary>Why the quick check cannot vouch for a file; any flag means its content must be hashed.</summary>
[Flags]
public enum StatDifferences
{
    None = 0,

    /// <summary>The catalog holds no record of the file.</summary>
    New = 1,

    /// <summary>The record has no content hash (every earlier attempt was unstable or failed).</summary>
    NeverHashed = 2,

    Size = 4,

    Modified = 8,

    /// <summary>Another file now bears the name (copy over, save by replace), or one side has no identity.</summary>
    Identity = 16,

    /// <summary>
    /// The stored stat was taken within the racy window after the file's last write, so a later write in
    /// the same timestamp tick could have left size and time unchanged (common practice: the "racily
    /// clean" rule of content-tracking tools).
    /// </summary>
    Racy = 32,
}
