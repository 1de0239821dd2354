using IndexKeeper.Service.Configuration;
using IndexKeeper.Tests.Support;

namespace IndexKeeper.Tests.WorkQueue;

/// <summary>Queue settings that are wrong before any connection: exit 2 naming the setting, nothing written.</summary>
public sealed class QueueSettingsTests
{
    [Theory]
    [InlineData("Host=db;Port=notaport", "Queue:Connection")]
    [InlineData("Hots=db;Database=x", "Queue:Connection")]
    [InlineData("Database=x", "Queue:Connection: names no Host")]
    [InlineData("Host=db;Password=secret-in-a-setting", "Queue:Connection: holds a Password")]
    public void Bad_connection_string_is_named_and_nothing_is_written(string connection, string named)
    {
        using var temp = new TempDirectory();
        Directory.CreateDirectory(temp.Combine("docs"));
        var result = CliRunner.Run(temp.Path, "run", "--index", "idx", "--root", "docs", "--listen", "127.0.0.1:0", "--Queue:Connection=" + connection);
        Assert.Equal(2, result.ExitCode);
        Assert.Contains(named, result.Stderr, StringComparison.Ordinal);
        Assert.DoesNotContain("secret-in-a-setting", result.Stderr, StringComparison.Ordinal);
        Assert.False(Directory.Exists(temp.Combine("idx")));
    }

    [Fact]
    public void Worker_without_a_connection_is_a_usage_error()
    {
        using var temp = new TempDirectory();
        Directory.CreateDirectory(temp.Combine("docs"));
        var result = CliRunner.Run(temp.Path, "worker", "--root", "docs");
        Assert.Equal(2, result.ExitCode);
        Assert.Contains("Queue:Connection", result.Stderr, StringComparison.Ordinal);
    }

    [Fact]
    public void Every_queue_problem_is_reported_at_once()
    {
        var options = new IndexKeeperOptions
        {
            Roots = [new RootOptions { Name = "docs", Path = "/srv/docs" }],
            Queue = new QueueOptions { Connection = "Host=db", PasswordFile = "/no/such/file", WhenUnreachable = "sometimes", LeaseSeconds = 6, HeartbeatSeconds = 10, ClaimBatch = 0 },
        };
        var problems = IndexKeeperOptionsValidator.Validate(options);
        Assert.Contains(problems, p => p.StartsWith("Queue:PasswordFile:", StringComparison.Ordinal));
        Assert.Contains(problems, p => p.StartsWith("Queue:WhenUnreachable:", StringComparison.Ordinal));
        Assert.Contains(problems, p => p.StartsWith("Queue:HeartbeatSeconds:", StringComparison.Ordinal));
        Assert.Contains(problems, p => p.StartsWith("Queue:ClaimBatch:", StringComparison.Ordinal));
    }

    [Fact]
    public void No_queue_setting_is_no_problem()
    {
        var options = new IndexKeeperOptions { Roots = [new RootOptions { Name = "docs", Path = "/srv/docs" }] };
        Assert.DoesNotContain(IndexKeeperOptionsValidator.Validate(options), p => p.StartsWith("Queue:", StringComparison.Ordinal));
    }
}
