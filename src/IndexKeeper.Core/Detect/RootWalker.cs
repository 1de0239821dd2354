namespace IndexKeeper.Core.Detect;

/// <summary>Hands out the root walker for the running platform.</summary>
public static class RootWalker
{
    /// <summary>On Linux the walk lists folders through their descriptors (raw names, no link races); elsewhere through .NET's file APIs.</summary>
    public static IRootWalker Create() =>
        new TreeWalker(OperatingSystem.IsLinux() ? new LinuxFolderSystem() : new ManagedFolderSystem());
}
