namespace IndexKeeper.Tests.Crash;

/// <summary>A fact that needs to mount a tmpfs (Linux, root); skipped where this process cannot.</summary>
internal sealed class TmpfsFactAttribute : FactAttribute
{
    public TmpfsFactAttribute()
    {
        if (!TmpfsMount.Available)
        {
            Skip = "needs to mount a tmpfs (Linux, run as root)";
        }
    }
}
