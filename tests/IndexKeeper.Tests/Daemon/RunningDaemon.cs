using System.Collections.Concurrent;
using System.Diagnostics;
using System.Net.Http.Headers;
using System.Text.Json;
using IndexKeeper.Service.Daemon;
using IndexKeeper.Tests.Support;

namespace IndexKeeper.Tests.Daemon;

/// <summary>
/// The real <c>indexkeeper run</c> process on a temp index, listening on a free loopback port (port 0; the
/// address is read from the endpoint file the daemon writes), with an HTTP client for its API.
/// </summary>
internal sealed class RunningDaemon : IDisposable
{
    public static readonly TimeSpan Patience = TimeSpan.FromSeconds(90);

    private readonly Process process;
    private readonly ConcurrentQueue<string> stderr = new();

    private RunningDaemon(Process process, string indexDirectory, Uri url, string? token)
    {
        this.process = process;
        IndexDirectory = indexDirectory;
        Client = new HttpClient { BaseAddress = url, Timeout = TimeSpan.FromSeconds(30) };
        if (token is not null)
        {
            Client.DefaultRequestHeaders.Authorization = new AuthenticationHeaderValue("Bearer", token);
        }
    }

    public HttpClient Client { get; }

    public string IndexDirectory { get; }

    public int ProcessId => process.Id;

    public string Stderr => string.Join('\n', stderr);

    /// <summary>Writes a token file into <paramref name="temp"/>, readable and writable by its owner only unless told otherwise (Unix modes).</summary>
    public static string WriteTokenFile(TempDirectory temp, string token, UnixFileMode mode = UnixFileMode.UserRead | UnixFileMode.UserWrite)
    {
        var tokenFile = temp.Write("token.txt", token + "\n");
        if (!OperatingSystem.IsWindows())
        {
            File.SetUnixFileMode(tokenFile, mode);
        }

        return tokenFile;
    }

    /// <summary>
    /// Starts <c>run</c> in <paramref name="workingDirectory"/> with <c>--index index</c>, the given arguments and
    /// environment variables, and waits for its API.
    /// </summary>
    public static RunningDaemon Start(string workingDirectory, IReadOnlyList<string> args, string? token = null, IReadOnlyDictionary<string, string>? environment = null)
    {
        var indexDirectory = Path.Combine(workingDirectory, "index");
        DaemonEndpoint.Remove(indexDirectory);
        var start = CliRunner.StartInfo(workingDirectory, ["run", "--index", "index", "--listen", "127.0.0.1:0", .. args]);
        foreach (var (name, value) in environment ?? new Dictionary<string, string>())
        {
            start.Environment[name] = value;
        }

        var process = new Process { StartInfo = start };
        var errors = new ConcurrentQueue<string>();
        process.ErrorDataReceived += (_, e) =>
        {
            if (e.Data is not null)
            {
                errors.Enqueue(e.Data);
            }
        };
        process.OutputDataReceived += (_, _) => { };
        process.Start();
        process.BeginErrorReadLine();
        process.BeginOutputReadLine();
        var clock = Stopwatch.StartNew();
        while (clock.Elapsed < Patience)
        {
            if (process.HasExited)
            {
                // Without a timeout WaitForExit also waits for the last stderr lines to be delivered.
                process.WaitForExit();
                throw new InvalidOperationException($"indexkeeper run exited {process.ExitCode}:\n{string.Join('\n', errors)}");
            }

            if (DaemonEndpoint.Read(indexDirectory) is { } endpoint && endpoint.ProcessId == process.Id)
            {
                var daemon = new RunningDaemon(process, indexDirectory, new Uri(endpoint.Url), token);
                foreach (var line in errors)
                {
                    daemon.stderr.Enqueue(line);
                }

                process.ErrorDataReceived += (_, e) =>
                {
                    if (e.Data is not null)
                    {
                        daemon.stderr.Enqueue(e.Data);
                    }
                };
                return daemon;
            }

            Thread.Sleep(50);
        }

        process.Kill(entireProcessTree: true);
        throw new TimeoutException("indexkeeper run did not write its endpoint file:\n" + string.Join('\n', errors));
    }

    public JsonElement GetJson(string path)
    {
        using var response = Client.GetAsync(path).GetAwaiter().GetResult();
        var body = response.Content.ReadAsStringAsync().GetAwaiter().GetResult();
        Assert.True(response.IsSuccessStatusCode, $"GET {path}: {(int)response.StatusCode} {body}");
        using var json = JsonDocument.Parse(body);
        return json.RootElement.Clone();
    }

    public string GetText(string path) => Client.GetStringAsync(path).GetAwaiter().GetResult();

    /// <summary>The body of /health whatever its status (503 when unhealthy).</summary>
    public string Health()
    {
        using var response = Client.GetAsync("/health").GetAwaiter().GetResult();
        return response.Content.ReadAsStringAsync().GetAwaiter().GetResult();
    }

    /// <summary>Polls until <paramref name="condition"/> holds, at most <see cref="Patience"/>; fails naming <paramref name="what"/>.</summary>
    public void WaitUntil(string what, Func<bool> condition)
    {
        var clock = Stopwatch.StartNew();
        while (!Holds(condition))
        {
            if (process.HasExited)
            {
                Assert.Fail($"the daemon exited ({process.ExitCode}) while waiting until {what}:\n{Stderr}");
            }

            if (clock.Elapsed > Patience)
            {
                Assert.Fail($"timed out after {Patience} waiting until {what}:\n{Stderr}");
            }

            Thread.Sleep(100);
        }
    }

    /// <summary>Like <see cref="WaitUntil"/>, but the daemon exiting also ends the wait: true when it exited.</summary>
    public bool WaitUntilOrExit(string what, Func<bool> condition)
    {
        var clock = Stopwatch.StartNew();
        while (!process.HasExited && !Holds(condition))
        {
            if (clock.Elapsed > Patience)
            {
                Assert.Fail($"timed out after {Patience} waiting until {what} or the daemon exits:\n{Stderr}");
            }

            Thread.Sleep(100);
        }

        if (process.HasExited)
        {
            process.WaitForExit();
        }

        return process.HasExited;
    }

    public int ExitCode => process.ExitCode;

    /// <summary>Paths (root/path) of the hits of a search.</summary>
    public IReadOnlyList<string> SearchPaths(string query)
    {
        var report = GetJson("/api/search?q=" + Uri.EscapeDataString(query) + "&k=20");
        return report.GetProperty("hits").EnumerateArray().Select(h => h.GetProperty("root").GetString() + "/" + h.GetProperty("path").GetString()).ToList();
    }

    /// <summary>A condition the daemon did not answer (it is exiting, or has exited) is false; the waits then say why.</summary>
    private static bool Holds(Func<bool> condition)
    {
        try
        {
            return condition();
        }
        catch (HttpRequestException)
        {
            return false;
        }
    }

    /// <summary>Sends SIGTERM (what systemd sends on stop) and returns the exit code, or null when it did not exit in time.</summary>
    public int? Terminate(TimeSpan within)
    {
        using (var kill = Process.Start("kill", ["-TERM", process.Id.ToString(System.Globalization.CultureInfo.InvariantCulture)]))
        {
            kill.WaitForExit();
            Assert.Equal(0, kill.ExitCode);
        }

        if (!process.WaitForExit(within))
        {
            return null;
        }

        process.WaitForExit();
        return process.ExitCode;
    }

    public void Dispose()
    {
        Client.Dispose();
        if (!process.HasExited)
        {
            process.Kill(entireProcessTree: true);
            process.WaitForExit();
        }

        process.Dispose();
    }
}
