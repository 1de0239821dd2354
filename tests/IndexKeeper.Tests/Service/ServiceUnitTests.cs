using System.Diagnostics;
using System.Globalization;
using System.Text.RegularExpressions;
using IndexKeeper.Tests.Support;

namespace IndexKeeper.Tests.Service;

/// <summary>
/// The shipped systemd unit (config/indexkeeper.service) rated by systemd's own <c>systemd-analyze security</c>
/// (Debian package systemd; offline mode reads the file, no running systemd needed): exposure 2.0 or below,
/// which systemd calls "OK", and the restart policy the daemon's fault handling relies on.
/// </summary>
public sealed partial class ServiceUnitTests
{
    private const string Analyzer = "/usr/bin/systemd-analyze";

    private static readonly string Unit = Path.Combine(RepositoryRoot.Path, "config", "indexkeeper.service");

    [AnalyzerFact]
    public void TheUnitIsRatedOkBySystemdAnalyzeSecurity()
    {
        var start = new ProcessStartInfo(Analyzer, ["security", "--offline=true", "--no-pager", Unit]) { RedirectStandardOutput = true, RedirectStandardError = true };
        using var process = Process.Start(start)!;
        var stderr = process.StandardError.ReadToEndAsync();
        var output = process.StandardOutput.ReadToEnd() + stderr.GetAwaiter().GetResult();
        process.WaitForExit();
        var overall = Overall().Match(output);
        Assert.True(overall.Success, "no overall exposure level in:\n" + output);
        var exposure = double.Parse(overall.Groups[1].Value, CultureInfo.InvariantCulture);
        Assert.True(exposure <= 2.0, $"exposure {exposure} is above 2.0:\n{output}");
    }

    [Fact]
    public void TheUnitRestartsOnFailureAndWaitsForTheReadyNotification()
    {
        var lines = File.ReadAllLines(Unit).Select(l => l.Trim()).ToList();
        Assert.Contains("Restart=on-failure", lines);
        Assert.Contains("Type=notify", lines);

        // Writable: the state directory only; the roots are read.
        Assert.Contains("ProtectSystem=strict", lines);
        Assert.Contains("ReadWritePaths=/var/lib/indexkeeper", lines);
    }

    [GeneratedRegex(@"Overall exposure level for indexkeeper\.service: (\d+\.\d)")]
    private static partial Regex Overall();

    /// <summary>Skipped, saying so, only where systemd-analyze is not installed (Debian package systemd).</summary>
    private sealed class AnalyzerFactAttribute : FactAttribute
    {
        public AnalyzerFactAttribute()
        {
            if (!File.Exists(Analyzer))
            {
                Skip = "systemd-analyze is not installed (Debian package systemd; ./install adds it)";
            }
        }
    }
}
