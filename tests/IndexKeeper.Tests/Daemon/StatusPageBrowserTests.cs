using System.Diagnostics;
using System.Globalization;
using IndexKeeper.Tests.EndToEnd;
using IndexKeeper.Tests.Support;

namespace IndexKeeper.Tests.Daemon;

/// <summary>
/// The status page in a real browser: Debian's chromium, headless, loads it from the daemon, runs its
/// script (the chart is drawn from the API's samples) without a console error; the screenshot is kept
/// under TestResults/ as an artefact.
/// </summary>
public sealed class StatusPageBrowserTests
{
    private const string Chromium = "/usr/bin/chromium";

    [ChromiumFact]
    public void TheChartRendersWithoutConsoleErrors()
    {
        using var temp = new TempDirectory();
        Directory.CreateDirectory(temp.Combine("store"));
        for (var i = 0; i < 4; i++)
        {
            File.WriteAllBytes(temp.Combine("store", $"survey-{i}.pdf"), StorePdfs.Document($"Fenwick{i}", 3));
        }

        using var daemon = RunningDaemon.Start(temp.Path, ["--root", "store", "--encoder", "hashed-terms", "--Daemon:SampleSeconds=0.2", "--Schedule:Windows:0=Mon-Sun 00:00-24:00"]);
        daemon.WaitUntil("the pages are embedded and sampled", () =>
            daemon.GetJson("/api/status").GetProperty("liveVectorSets").GetInt64() == 12 && daemon.GetJson("/api/daemon").GetProperty("samples").GetArrayLength() >= 5);
        var url = daemon.Client.BaseAddress!.ToString();

        var dom = RunChromium(temp, ["--dump-dom", url], out var log);
        Assert.Contains("data-rendered=\"1\"", dom, StringComparison.Ordinal);
        Assert.DoesNotContain("data-errors", dom, StringComparison.Ordinal);
        Assert.Matches("<svg id=\"chart\"[^>]*data-points=\"([5-9]|[1-9][0-9]+)\"", dom);
        Assert.Matches("<path d=\"M[0-9.]+ [0-9.]+ L", dom);
        Assert.Contains("<dt>documents</dt><dd>4</dd>", dom, StringComparison.Ordinal);
        Assert.Contains("nothing is quarantined", dom, StringComparison.Ordinal);
        // Chromium logs a page's console messages as CONSOLE lines on stderr with --enable-logging=stderr (from memory).
        Assert.DoesNotContain(log.Split('\n'), l => l.Contains("CONSOLE", StringComparison.Ordinal) && (l.Contains("rror", StringComparison.Ordinal) || l.Contains("Uncaught", StringComparison.Ordinal)));

        var artefacts = Directory.CreateDirectory(Path.Combine(AppContext.BaseDirectory, "TestResults", "status-page")).FullName;
        var screenshot = Path.Combine(artefacts, "status-page.png");
        File.Delete(screenshot);
        RunChromium(temp, ["--screenshot=" + screenshot, "--window-size=1280,1100", url], out _);
        Assert.True(File.Exists(screenshot) && new FileInfo(screenshot).Length > 10_000, "the screenshot should be written: " + screenshot);
        Assert.Equal(0, daemon.Terminate(RunningDaemon.Patience));
    }

    /// <summary>
    /// A migration waiting for its window, shown with the serving and the active encoder, and every time in the
    /// configured zone: Pacific/Chatham (IANA time zone database; an offset of 45 minutes past the hour, so no
    /// zone a machine happens to be in shows the same clock).
    /// </summary>
    [ChromiumFact]
    public void TheEncodersTheMigrationAndTheNextWindowShowInTheConfiguredZone()
    {
        using var temp = new TempDirectory();
        Directory.CreateDirectory(temp.Combine("store"));
        for (var i = 0; i < 3; i++)
        {
            File.WriteAllBytes(temp.Combine("store", $"hydrant-{i}.pdf"), StorePdfs.Document($"Oxbridge{i}", 2));
        }

        string[] common = ["--root", "store", "--encoder", "hashed-terms", "--Daemon:SampleSeconds=0.2"];
        using (var first = RunningDaemon.Start(temp.Path, [.. common, "--Schedule:Windows:0=Mon-Sun 00:00-24:00"]))
        {
            first.WaitUntil("the pages are embedded", () => first.GetJson("/api/status").GetProperty("liveVectorSets").GetInt64() == 6);
            Assert.Equal(0, first.Terminate(RunningDaemon.Patience));
        }

        // A one-hour window three hours from now in that zone: closed now, so the migration waits for it.
        var zone = TimeZoneInfo.FindSystemTimeZoneById("Pacific/Chatham");
        var now = TimeZoneInfo.ConvertTime(DateTimeOffset.UtcNow, zone);
        var startHour = (now.Hour + 3) % 24;
        var opens = new DateTimeOffset(now.Date.AddDays(startHour > now.Hour ? 0 : 1).AddHours(startHour), zone.GetUtcOffset(now.Date.AddHours(startHour)));
        var window = string.Create(CultureInfo.InvariantCulture, $"Mon-Sun {startHour:00}:00-{startHour + 1:00}:00");

        // A new d is a new encoder id: every page migrates, inside windows only.
        using var daemon = RunningDaemon.Start(temp.Path, [.. common, "--Encoder:Dimensions=64", "--Schedule:TimeZone=Pacific/Chatham", "--Schedule:Windows:0=" + window]);
        daemon.WaitUntil("the migration waits with every page", () => daemon.GetJson("/api/daemon").GetProperty("migration") is var m
            && m.GetProperty("running").GetBoolean() && m.GetProperty("pagesWaiting").GetInt64() == 6);
        var report = daemon.GetJson("/api/daemon");
        Assert.Equal("Pacific/Chatham", report.GetProperty("timeZone").GetString());
        Assert.Equal(opens, report.GetProperty("nextWindowOpens").GetDateTimeOffset());
        Assert.EndsWith(opens.ToString("zzz", CultureInfo.InvariantCulture), report.GetProperty("nextWindowOpens").GetString(), StringComparison.Ordinal);

        var dom = RunChromium(temp, ["--dump-dom", daemon.Client.BaseAddress!.ToString()], out _);
        Assert.Contains("data-rendered=\"1\"", dom, StringComparison.Ordinal);
        Assert.DoesNotContain("data-errors", dom, StringComparison.Ordinal);
        Assert.Contains("Serving encoder (searches rank with it): hashed-terms", dom, StringComparison.Ordinal);
        Assert.Contains("Migration: 0 of 6 pages have vectors of the active encoder (0.0 %); 6 wait.", dom, StringComparison.Ordinal);
        Assert.Contains("No finish estimate yet: the active encoder has no measured rate.", dom, StringComparison.Ordinal);
        Assert.Contains(string.Create(CultureInfo.InvariantCulture, $"The next window opens {opens:yyyy-MM-dd HH:mm:ss} Pacific/Chatham."), dom, StringComparison.Ordinal);
        Assert.Equal(0, daemon.Terminate(RunningDaemon.Patience));
    }

    internal static string RunChromium(TempDirectory temp, IReadOnlyList<string> args, out string log)
    {
        var profile = Directory.CreateDirectory(temp.Combine("chromium-profile-" + Guid.NewGuid().ToString("N")[..6])).FullName;
        var start = new ProcessStartInfo(Chromium)
        {
            RedirectStandardOutput = true,
            RedirectStandardError = true,
        };
        foreach (var arg in new[]
        {
            "--headless", "--no-sandbox", "--disable-gpu", "--disable-quic", "--no-first-run", "--disable-background-networking",
            "--disable-component-update", "--disable-sync", "--user-data-dir=" + profile, "--enable-logging=stderr", "--v=0",
            "--virtual-time-budget=4000", "--hide-scrollbars",
        })
        {
            start.ArgumentList.Add(arg);
        }

        foreach (var arg in args)
        {
            start.ArgumentList.Add(arg);
        }

        using var process = Process.Start(start)!;
        var stdout = process.StandardOutput.ReadToEndAsync();
        var stderr = process.StandardError.ReadToEndAsync();
        if (!process.WaitForExit(TimeSpan.FromSeconds(90)))
        {
            process.Kill(entireProcessTree: true);
            throw new TimeoutException("chromium did not finish in 90 s: " + string.Join(' ', args));
        }

        log = stderr.Result;
        return stdout.Result;
    }

    /// <summary>Skipped, saying so, only where chromium is not installed; CI installs it (the install script's package list).</summary>
    internal sealed class ChromiumFactAttribute : FactAttribute
    {
        public ChromiumFactAttribute()
        {
            if (!File.Exists(Chromium))
            {
                Skip = "chromium is not installed (Debian package chromium; ./install adds it)";
            }
        }
    }
}
