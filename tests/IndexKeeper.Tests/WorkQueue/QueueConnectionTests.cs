using IndexKeeper.Service.WorkQueue;
using IndexKeeper.Tests.Support;

namespace IndexKeeper.Tests.WorkQueue;

/// <summary>
/// Connecting to a real PostgreSQL: the schema is created at its version; a refused login and a newer
/// schema are each a clear error naming Queue:Connection, exit 2, and nothing written (neither the index
/// nor the database).
/// </summary>
[Collection(PostgresCollection.Name)]
public sealed class QueueConnectionTests(PostgresServer server)
{
    [Fact]
    public void Worker_creates_the_schema_at_its_version()
    {
        var database = server.CreateDatabase();
        using var temp = new TempDirectory();
        Directory.CreateDirectory(temp.Combine("docs"));

        var result = CliRunner.Run(temp.Path, QueueArgs(database, "worker", "--root", "docs", "--until-idle"));
        Assert.True(result.ExitCode == 0, result.Stderr);
        Assert.Equal(QueueSchema.Version, server.Scalar(database, $"SELECT version FROM {QueueSchema.Name}.schema_version"));
        Assert.Equal(0, server.Scalar(database, $"SELECT count(*) FROM {QueueSchema.Name}.jobs"));
    }

    [Fact]
    public void Wrong_password_exits_2_naming_the_setting_and_writes_nothing()
    {
        var database = server.CreateDatabase();
        using var temp = new TempDirectory();
        Directory.CreateDirectory(temp.Combine("docs"));
        var wrong = temp.Write("wrong-password", "not-the-password\n");
        var result = CliRunner.Run(temp.Path, "run", "--index", "idx", "--root", "docs", "--listen", "127.0.0.1:0", "--Queue:Connection=" + server.Connection(database), "--Queue:PasswordFile=" + wrong);
        Assert.Equal(2, result.ExitCode);
        Assert.Contains("Queue:Connection", result.Stderr, StringComparison.Ordinal);

        // SQLSTATE 28P01 invalid_password: PostgreSQL documentation, Appendix A.
        Assert.Contains("28P01", result.Stderr, StringComparison.Ordinal);
        Assert.DoesNotContain("not-the-password", result.Stderr, StringComparison.Ordinal);
        Assert.False(Directory.Exists(temp.Combine("idx")));
        Assert.Equal(0, server.Scalar(database, $"SELECT count(*) FROM pg_namespace WHERE nspname = '{QueueSchema.Name}'"));

        var worker = CliRunner.Run(temp.Path, "worker", "--root", "docs", "--Queue:Connection=" + server.Connection(database), "--Queue:PasswordFile=" + wrong);
        Assert.Equal(2, worker.ExitCode);
        Assert.Contains("Queue:Connection", worker.Stderr, StringComparison.Ordinal);
    }

    [Fact]
    public void Newer_schema_exits_2_naming_the_setting_and_writes_nothing()
    {
        var database = server.CreateDatabase();
        using (var connection = server.Admin(database))
        using (var command = connection.CreateCommand())
        {
            command.CommandText = $"CREATE SCHEMA {QueueSchema.Name}; CREATE TABLE {QueueSchema.Name}.schema_version (singleton boolean PRIMARY KEY DEFAULT true, version integer NOT NULL); INSERT INTO {QueueSchema.Name}.schema_version (version) VALUES ({QueueSchema.Version + 1});";
            command.ExecuteNonQuery();
        }

        using var temp = new TempDirectory();
        Directory.CreateDirectory(temp.Combine("docs"));
        var run = CliRunner.Run(temp.Path, QueueArgs(database, "run", "--index", "idx", "--root", "docs", "--listen", "127.0.0.1:0"));
        Assert.Equal(2, run.ExitCode);
        Assert.Contains("Queue:Connection", run.Stderr, StringComparison.Ordinal);
        Assert.Contains($"version {QueueSchema.Version + 1}", run.Stderr, StringComparison.Ordinal);
        Assert.False(Directory.Exists(temp.Combine("idx")));

        var worker = CliRunner.Run(temp.Path, QueueArgs(database, "worker", "--root", "docs"));
        Assert.Equal(2, worker.ExitCode);
        Assert.Contains($"version {QueueSchema.Version + 1}", worker.Stderr, StringComparison.Ordinal);

        // Nothing was created beside the newer version's table.
        Assert.Equal(1, server.Scalar(database, $"SELECT count(*) FROM pg_tables WHERE schemaname = '{QueueSchema.Name}'"));
    }

    private string[] QueueArgs(string database, params string[] args) =>
        [.. args, "--Queue:Connection=" + server.Connection(database), "--Queue:PasswordFile=" + server.PasswordFile];
}
