using System.Text.Json;
using IndexKeeper.Tests.Daemon;
using IndexKeeper.Tests.EndToEnd;
using IndexKeeper.Tests.Support;

namespace IndexKeeper.Tests.WorkQueue;

/// <summary>
/// A small store of real multi-page PDFs (PdfPig's builder, every page its own line), a reference index
/// built by one process (<c>sync</c>), a database of its own on the shared server, and the settings that
/// run a coordinator and workers over them. Workers read a copy of the store at another path: the share
/// mounted elsewhere on another machine.
/// </summary>
internal sealed class QueueStore : IDisposable
{
    public const int Documents = 8;
    public const int PagesPerDocument = 3;
    public const int Pages = Documents * PagesPerDocument;

    public static readonly string[] Queries = ["Harrowmere pump register", "register entry 2", "site 5 register entry 3", "entry 1"];

    private readonly PostgresServer server;

    public QueueStore(PostgresServer server)
    {
        this.server = server;
        Database = server.CreateDatabase();
        for (var i = 1; i <= Documents; i++)
        {
            var bytes = StorePdfs.Document($"site {i} pump", PagesPerDocument);
            foreach (var folder in new[] { "docs", "elsewhere/docs" })
            {
                var path = Temp.Combine(folder, $"site-{i}.pdf");
                Directory.CreateDirectory(Path.GetDirectoryName(path)!);
                File.WriteAllBytes(path, bytes);
                File.SetLastWriteTimeUtc(path, DateTime.UtcNow.AddHours(-1));
            }
        }

        var reference = CliRunner.Run(Temp.Path, "sync", "--index", "reference", "--root", "docs", "--json");
        Assert.True(reference.ExitCode == 0, reference.Stderr);
    }

    public TempDirectory Temp { get; } = new();

    public string Database { get; }

    public string ReferenceIndex => Temp.Combine("reference");

    public string CoordinatorIndex => Temp.Combine("index");

    /// <summary>The coordinator's arguments beside <c>run --index index</c>.</summary>
    public string[] CoordinatorArgs => ["--root", "docs", "--Daemon:SampleSeconds=1", .. QueueArgs()];

    /// <summary>A worker's arguments: its own configuration file mapping root <c>docs</c> to the copy, and any settings given.</summary>
    public string[] WorkerArgs(string name, params string[] settings)
    {
        var config = Temp.Write($"worker-{name}.json", JsonSerializer.Serialize(new
        {
            Roots = new[] { new { Name = "docs", Path = Temp.Combine("elsewhere", "docs") } },
        }));
        return ["--config", config, "--Queue:WorkerName=" + name, .. QueueArgs(), .. settings];
    }

    public long Scalar(string sql) => server.Scalar(Database, sql);

    /// <summary>Waits until the coordinator reports every page of the store with a live vector set and nothing queued.</summary>
    public static void WaitUntilComplete(RunningDaemon daemon) =>
        daemon.WaitUntil("every page has vectors", () =>
        {
            var status = daemon.GetJson("/api/status");
            return status.GetProperty("pages").GetInt64() == Pages && status.GetProperty("liveVectorSets").GetInt64() == Pages && status.GetProperty("queued").GetInt64() == 0;
        });

    /// <summary>The coordinator's index equals the single-process build: same page keys, same stored bytes per key, same top hits.</summary>
    public void AssertSameAsReference()
    {
        var reference = IndexVectors.Read(ReferenceIndex);
        var distributed = IndexVectors.Read(CoordinatorIndex);
        Assert.Equal(Pages, reference.Count);
        Assert.Equal(reference.Keys.Order(StringComparer.Ordinal), distributed.Keys.Order(StringComparer.Ordinal));
        foreach (var (key, bytes) in reference)
        {
            Assert.True(distributed[key] == bytes, $"page {key[..12]}: stored vectors differ from the single-process build");
        }

        foreach (var query in Queries)
        {
            Assert.Equal(Hits(ReferenceIndex, query), Hits(CoordinatorIndex, query));
        }

        var verify = CliRunner.Run(Temp.Path, "verify", "--index", CoordinatorIndex);
        Assert.True(verify.ExitCode == 0, verify.Stdout + verify.Stderr);
    }

    public void Dispose() => Temp.Dispose();

    private List<string> Hits(string index, string query)
    {
        var result = CliRunner.Run(Temp.Path, "search", query, "--index", index, "-k", "10", "--json");
        Assert.True(result.ExitCode == 0, result.Stderr);
        using var json = JsonDocument.Parse(result.Stdout);
        return json.RootElement.GetProperty("hits").EnumerateArray()
            .Select(h => $"{h.GetProperty("path").GetString()}#{h.GetProperty("page").GetInt32()}={h.GetProperty("score").GetDouble():R}")
            .ToList();
    }

    private string[] QueueArgs() =>
        ["--Queue:Connection=" + server.Connection(Database), "--Queue:PasswordFile=" + server.PasswordFile, "--Queue:LeaseSeconds=5", "--Queue:HeartbeatSeconds=1"];
}
