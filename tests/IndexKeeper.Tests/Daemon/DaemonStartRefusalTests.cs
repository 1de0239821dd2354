using System.Net;
using System.Net.Sockets;
using IndexKeeper.Tests.Detect;
using IndexKeeper.Tests.Support;

namespace IndexKeeper.Tests.Daemon;

/// <summary>
/// Settings the daemon cannot honour stop it before it serves anything: exit 2 and one line naming the
/// setting and the fix, never a stack trace.
/// </summary>
public sealed class DaemonStartRefusalTests
{
    private const string Token = "kestrel-quay-8812-lantern";

    [LinuxTheory]
    [InlineData(UnixFileMode.UserRead | UnixFileMode.UserWrite | UnixFileMode.GroupRead | UnixFileMode.OtherRead, "644")]
    [InlineData(UnixFileMode.UserRead | UnixFileMode.UserWrite | UnixFileMode.GroupRead, "640")]
    [InlineData(UnixFileMode.UserRead | UnixFileMode.UserWrite | UnixFileMode.OtherWrite, "602")]
    public void ATokenFileOthersCanReadOrWriteIsRefused(UnixFileMode mode, string octal)
    {
        // As OpenSSH refuses a private key whose mode allows group or others any access (a mode & 077 test;
        // ssh(1), "FILES": "These files contain sensitive data and should be readable by the user but not
        // accessible by others").
        using var temp = new TempDirectory();
        Directory.CreateDirectory(temp.Combine("store"));
        var tokenFile = RunningDaemon.WriteTokenFile(temp, Token, mode);
        var refusal = Refused(temp.Path, ["--root", "store", "--encoder", "hashed-terms", "--Daemon:TokenFile=" + tokenFile]);
        Assert.Contains("Daemon:TokenFile", refusal, StringComparison.Ordinal);
        Assert.Contains("chmod 600", refusal, StringComparison.Ordinal);
        Assert.Contains(octal, refusal, StringComparison.Ordinal);
        Assert.False(File.Exists(temp.Combine("index", "daemon.json")));
    }

    [LinuxFact]
    public void ATokenFileOnlyItsOwnerCanReadIsAccepted()
    {
        using var temp = new TempDirectory();
        Directory.CreateDirectory(temp.Combine("store"));
        var tokenFile = RunningDaemon.WriteTokenFile(temp, Token, UnixFileMode.UserRead);
        using var daemon = RunningDaemon.Start(temp.Path, ["--root", "store", "--encoder", "hashed-terms", "--Daemon:TokenFile=" + tokenFile], Token);
        Assert.Equal(0, daemon.GetJson("/api/status").GetProperty("documents").GetInt64());
        Assert.Equal(0, daemon.Terminate(RunningDaemon.Patience));
    }

    [Theory]
    [InlineData("::ffff:127.0.0.1:{0}")]
    [InlineData("[::ffff:127.0.0.1]:{0}")]
    [InlineData("::1:{0}")]
    public void AListenAddressThatIsNotHostAndPortIsOneCleanLine(string pattern)
    {
        using var temp = new TempDirectory();
        Directory.CreateDirectory(temp.Combine("store"));
        var listen = string.Format(System.Globalization.CultureInfo.InvariantCulture, pattern, FreePort());
        var refusal = Refused(temp.Path, ["--root", "store", "--encoder", "hashed-terms", "--listen", listen]);
        Assert.Contains("Daemon:Listen", refusal, StringComparison.Ordinal);
    }

    [Fact]
    public void ABusyPortIsOneCleanLine()
    {
        using var temp = new TempDirectory();
        Directory.CreateDirectory(temp.Combine("store"));
        var holder = new TcpListener(IPAddress.Loopback, 0);
        holder.Start();
        try
        {
            var port = ((IPEndPoint)holder.LocalEndpoint).Port;
            var refusal = Refused(temp.Path, ["--root", "store", "--encoder", "hashed-terms", "--listen", $"127.0.0.1:{port}"]);
            Assert.Contains("Daemon:Listen", refusal, StringComparison.Ordinal);
            Assert.Contains($"127.0.0.1:{port}", refusal, StringComparison.Ordinal);
        }
        finally
        {
            holder.Stop();
        }

        Assert.False(File.Exists(temp.Combine("index", "daemon.json")));
    }

    /// <summary>
    /// Runs <c>run</c> expecting a refusal: exit 2 with one line on stderr and no stack trace. A daemon that
    /// starts instead fails the test (and is stopped).
    /// </summary>
    private static string Refused(string workingDirectory, IReadOnlyList<string> args)
    {
        RunningDaemon? started = null;
        try
        {
            // A --listen in args comes after RunningDaemon's own 127.0.0.1:0 and wins.
            started = RunningDaemon.Start(workingDirectory, args);
        }
        catch (InvalidOperationException ex)
        {
            var lines = ex.Message.Split('\n', StringSplitOptions.RemoveEmptyEntries);
            Assert.True(lines[0] == "indexkeeper run exited 2:", ex.Message);
            var stderr = lines.Skip(1).ToList();
            Assert.True(stderr.Count == 1, "expected one line on stderr:\n" + string.Join('\n', stderr));
            Assert.DoesNotContain("   at ", ex.Message, StringComparison.Ordinal);
            Assert.StartsWith("indexkeeper: ", stderr[0], StringComparison.Ordinal);
            return stderr[0];
        }
        finally
        {
            started?.Dispose();
        }

        Assert.Fail("the daemon started although it should have refused");
        return string.Empty;
    }

    private static int FreePort()
    {
        var probe = new TcpListener(IPAddress.Loopback, 0);
        probe.Start();
        var port = ((IPEndPoint)probe.LocalEndpoint).Port;
        probe.Stop();
        return port;
    }
}
