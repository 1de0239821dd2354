namespace IndexKeeper.Core.Detect;

/// <summary>How a hashing attempt ended.</summary>
public enum FileHashStatus
{
    /// <summary>Same size, modification time and identity before and after the read: the digest is the file's.</summary>
    Stable,

    /// <summary>The file changed or was replaced while being read; the digest is dropped. Retry after it settles.</summary>
    Unstable,

    /// <summary>Nothing at the path any more.</summary>
    Missing,

    /// <summary>Permission denied or an I/O error; see the detail.</summary>
    Inaccessible,

    /// <summary>The path is a link, folder, device or pipe, not a regular file.</summary>
    NotRegularFile,
}
