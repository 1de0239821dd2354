namespace IndexKeeper.Core.Detect;

/// <summary>
/// What the operating system says makes a file itself: (device, inode) on Unix, (volume serial,
/// file index) on Windows. A rename keeps it; a copy or a save-by-replace gets a new one.
/// </summary>
public readonly record struct FileIdentity(ulong Device, ulong Index)
{
    public static FileIdentity None => default;
}
