namespace IndexKeeper.Tests.Monitoring;

/// <summary>Skipped, saying so, only where Debian's prometheus package is not installed; CI installs it (./install).</summary>
internal sealed class PromtoolFactAttribute : FactAttribute
{
    public PromtoolFactAttribute()
    {
        if (!File.Exists(Promtool.Path) || !File.Exists(Promtool.ServerPath))
        {
            Skip = "promtool or prometheus is not installed (Debian package prometheus; ./install adds it)";
        }
    }
}
