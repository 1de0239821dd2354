using System.Diagnostics;
using System.Globalization;
using System.Net;
using System.Net.Sockets;
using IndexKeeper.Service.Configuration;
using IndexKeeper.Service.WorkQueue;
using Npgsql;

namespace IndexKeeper.Tests.WorkQueue;

/// <summary>
/// A throwaway PostgreSQL from Debian's <c>postgresql</c> package for the work-queue tests, one per test run
/// (<see cref="PostgresCollection"/>): initdb into a temp folder, the server on a free loopback port with
/// password (SCRAM) logins over TCP, stopped and deleted after. initdb and postgres refuse to run as root,
/// so as root they run as the package's <c>postgres</c> user (runuser). Each test takes a database of its own.
/// </summary>
public sealed class PostgresServer : IDisposable
{
    public const string User = "ikadmin";

    public const string Password = "harrowmere-queue-test";

    private readonly string folder;
    private readonly string bin;
    private readonly bool asRoot;

    public PostgresServer()
    {
        bin = FindBin();
        asRoot = Environment.UserName == "root";
        folder = Path.Combine(Path.GetTempPath(), "ik-pg-" + Guid.NewGuid().ToString("N")[..10]);
        Directory.CreateDirectory(folder);
        var passwordFile = Path.Combine(folder, "pw");
        File.WriteAllText(passwordFile, Password + "\n");
        PasswordFile = Path.Combine(Path.GetTempPath(), "ik-pgpass-" + Guid.NewGuid().ToString("N")[..10]);
        File.WriteAllText(PasswordFile, Password + "\n");
        if (asRoot)
        {
            Run("chown", ["-R", "postgres:postgres", folder], asPostgres: false);
        }

        Port = FreePort();
        Run(Path.Combine(bin, "initdb"), ["-D", Path.Combine(folder, "data"), "-U", User, "--pwfile", passwordFile, "--auth-local=trust", "--auth-host=scram-sha-256", "-E", "UTF8", "--no-sync", "--no-instructions"]);
        Start();
    }

    public int Port { get; }

    /// <summary>A file whose first line is the password (what Queue:PasswordFile names).</summary>
    public string PasswordFile { get; }

    /// <summary>A connection string without a password (as Queue:Connection takes it) for <paramref name="database"/>.</summary>
    public string Connection(string database) => $"Host=127.0.0.1;Port={Port};Username={User};Database={database}";

    /// <summary>A new empty database; returns its name.</summary>
    public string CreateDatabase()
    {
        var name = "ik_" + Guid.NewGuid().ToString("N")[..12];
        using var connection = Admin("postgres");
        using var command = new NpgsqlCommand($"CREATE DATABASE {name}", connection);
        command.ExecuteNonQuery();
        return name;
    }

    /// <summary>A new database with the queue's tables, opened as the tool opens it (<see cref="QueueDatabase"/>).</summary>
    internal NpgsqlDataSource CreateQueue()
    {
        var source = QueueDatabase.Create(new QueueOptions { Connection = Connection(CreateDatabase()), PasswordFile = PasswordFile }, "indexkeeper-test");
        QueueSchema.Ensure(source, migrate: true);
        return source;
    }

    /// <summary>
    /// An open connection with the password, for a test's own look into a database. Not pooled: a pooled
    /// connection would outlive a restart of the server and fail on its first use after it.
    /// </summary>
    public NpgsqlConnection Admin(string database)
    {
        var connection = new NpgsqlConnection(Connection(database) + ";Password=" + Password + ";Pooling=false");
        connection.Open();
        return connection;
    }

    public long Scalar(string database, string sql)
    {
        using var connection = Admin(database);
        using var command = new NpgsqlCommand(sql, connection);
        return Convert.ToInt64(command.ExecuteScalar(), CultureInfo.InvariantCulture);
    }

    /// <summary>Starts the server (again) on its port; returns once it accepts connections.</summary>
    public void Start() =>
        Run(Path.Combine(bin, "pg_ctl"), [
            "-D", Path.Combine(folder, "data"), "-l", Path.Combine(folder, "server.log"), "-w", "-t", "60",
            "-o", $"-p {Port} -k {folder} -c listen_addresses=127.0.0.1 -c fsync=off -c max_connections=100",
            "start"]);

    /// <summary>Stops the server at once, as a crash or a network cut looks to its clients.</summary>
    public void Stop() => Run(Path.Combine(bin, "pg_ctl"), ["-D", Path.Combine(folder, "data"), "-m", "immediate", "-w", "stop"]);

    public void Dispose()
    {
        try
        {
            Stop();
        }
        finally
        {
            Directory.Delete(folder, recursive: true);
            File.Delete(PasswordFile);
        }
    }

    private static string FindBin()
    {
        // Debian installs each major version under /usr/lib/postgresql/N/bin; the newest one is taken.
        var versions = Directory.Exists("/usr/lib/postgresql") ? Directory.GetDirectories("/usr/lib/postgresql") : [];
        var bin = versions
            .Select(v => (Version: int.TryParse(Path.GetFileName(v), out var n) ? n : 0, Bin: Path.Combine(v, "bin")))
            .Where(v => File.Exists(Path.Combine(v.Bin, "initdb")))
            .OrderByDescending(v => v.Version)
            .Select(v => v.Bin)
            .FirstOrDefault();
        return bin ?? throw new InvalidOperationException("PostgreSQL's initdb was not found under /usr/lib/postgresql/*/bin; run ./install (it installs Debian's postgresql package).");
    }

    /// <summary>A loopback TCP port free at this moment.</summary>
    public static int FreePort()
    {
        using var listener = new TcpListener(IPAddress.Loopback, 0);
        listener.Start();
        return ((IPEndPoint)listener.LocalEndpoint).Port;
    }

    private void Run(string program, IReadOnlyList<string> args, bool asPostgres = true)
    {
        var start = new ProcessStartInfo(asRoot && asPostgres ? "runuser" : program)
        {
            RedirectStandardOutput = true,
            RedirectStandardError = true,
            UseShellExecute = false,
            WorkingDirectory = folder,
        };
        if (asRoot && asPostgres)
        {
            foreach (var arg in (string[])["-u", "postgres", "--", program])
            {
                start.ArgumentList.Add(arg);
            }
        }

        foreach (var arg in args)
        {
            start.ArgumentList.Add(arg);
        }

        using var process = Process.Start(start) ?? throw new InvalidOperationException($"{program} did not start");
        var stdout = process.StandardOutput.ReadToEndAsync();
        var stderr = process.StandardError.ReadToEndAsync();
        if (!process.WaitForExit(TimeSpan.FromMinutes(2)))
        {
            process.Kill(entireProcessTree: true);
            throw new TimeoutException($"{program} did not finish in 2 minutes");
        }

        if (process.ExitCode != 0)
        {
            var log = Path.Combine(folder, "server.log");
            throw new InvalidOperationException(
                $"{program} {string.Join(' ', args)} exited {process.ExitCode}{(asRoot && asPostgres ? " (run as the postgres user: initdb and postgres refuse root)" : string.Empty)}:\n{stdout.Result}\n{stderr.Result}"
                + (File.Exists(log) ? "\nserver log:\n" + File.ReadAllText(log) : string.Empty));
        }
    }
}
