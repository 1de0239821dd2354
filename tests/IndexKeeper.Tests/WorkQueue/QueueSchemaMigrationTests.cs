using IndexKeeper.Service.Configuration;
using IndexKeeper.Service.WorkQueue;
using Npgsql;

namespace IndexKeeper.Tests.WorkQueue;

/// <summary>
/// Version 1 tables (float32 results) met by this build: the coordinator migrates them, and results an older
/// worker left are encoded again rather than read; a worker of this build refuses to migrate and writes nothing.
/// </summary>
[Collection(PostgresCollection.Name)]
public sealed class QueueSchemaMigrationTests(PostgresServer server)
{
    private const string Encoder = "1111111111111111111111111111111111111111111111111111111111111111";

    private (string Database, NpgsqlDataSource Source) Version1WithResults()
    {
        var database = server.CreateDatabase();
        using (var admin = server.Admin(database))
        using (var command = admin.CreateCommand())
        {
            command.CommandText = QueueSchema.CreateVersion1 + $"""
                INSERT INTO {QueueSchema.Name}.jobs (page_key, encoder_id, root_name, relative_path, page_number, file_hash, priority, state, worker, result_encoder_id, result, finished_at)
                VALUES ('{new string('a', 64)}', '{Encoder}', 'docs', 'a.pdf', 1, '{new string('e', 64)}', 0, 2, 'old-worker', '{Encoder}', '\x494b5657'::bytea, now()),
                       ('{new string('b', 64)}', '{Encoder}', 'docs', 'b.pdf', 1, '{new string('e', 64)}', 0, 0, NULL, NULL, NULL, NULL);
                """;
            command.ExecuteNonQuery();
        }

        return (database, QueueDatabase.Create(new QueueOptions { Connection = server.Connection(database), PasswordFile = server.PasswordFile }, "indexkeeper-test"));
    }

    [Fact]
    public void Coordinator_migrates_and_old_results_are_encoded_again()
    {
        var (database, source) = Version1WithResults();
        using (source)
        {
            Assert.Equal(1, QueueSchema.Ensure(source, migrate: true));
            Assert.Equal(QueueSchema.Version, server.Scalar(database, $"SELECT version FROM {QueueSchema.Name}.schema_version"));

            // The float32 column is gone under its old name: an older worker's hand-back cannot land in it.
            Assert.Equal(0, server.Scalar(database, $"SELECT count(*) FROM information_schema.columns WHERE table_schema = '{QueueSchema.Name}' AND column_name = 'result'"));
            Assert.Equal(2, server.Scalar(database, $"SELECT count(*) FROM {QueueSchema.Name}.jobs WHERE state = 0 AND result_float16 IS NULL AND worker IS NULL"));
            Assert.Empty(new JobTable(source).Finished(10).Taken);

            // Twice is once.
            Assert.Equal(QueueSchema.Version, QueueSchema.Ensure(source, migrate: true));
        }
    }

    [Fact]
    public void Worker_refuses_older_tables_and_writes_nothing()
    {
        var (database, source) = Version1WithResults();
        using (source)
        {
            var refused = Assert.Throws<ConfigurationException>(() => QueueDatabase.Check(source, migrate: false));
            Assert.Contains("Queue:Connection", string.Join('\n', refused.Problems), StringComparison.Ordinal);
            Assert.Contains("older than this build's", string.Join('\n', refused.Problems), StringComparison.Ordinal);
            Assert.Equal(1, server.Scalar(database, $"SELECT version FROM {QueueSchema.Name}.schema_version"));
            Assert.Equal(1, server.Scalar(database, $"SELECT count(*) FROM {QueueSchema.Name}.jobs WHERE state = 2"));
        }
    }
}
