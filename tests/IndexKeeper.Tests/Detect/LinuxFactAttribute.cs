namespace IndexKeeper.Tests.Detect;

/// <summary>A fact that needs Linux (statx, coreutils, raw-byte names); skipped elsewhere.</summary>
internal sealed class LinuxFactAttribute : FactAttribute
{
    public LinuxFactAttribute()
    {
        if (!OperatingSystem.IsLinux())
        {
            Skip = "needs Linux";
        }
    }
}
