namespace IndexKeeper.Tests.Detect;

/// <summary>A theory that needs Linux; skipped elsewhere.</summary>
internal sealed class LinuxTheoryAttribute : TheoryAttribute
{
    public LinuxTheoryAttribute()
    {
        if (!OperatingSystem.IsLinux())
        {
            Skip = "needs Linux";
        }
    }
}
