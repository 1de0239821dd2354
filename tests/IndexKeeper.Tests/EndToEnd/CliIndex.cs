using System.Text.Json;
using IndexKeeper.Tests.Support;

namespace IndexKeeper.Tests.EndToEnd;

/// <summary>
/// A document store and its index in a temp folder, driven through the real <c>indexkeeper</c> executable
/// (real reader worker, real catalog) exactly as an operator would: every command gets the same
/// <c>--index</c> and <c>--root</c> options, and <c>--json</c> answers are parsed as the contract says.
/// </summary>
internal sealed class CliIndex : IDisposable
{
    private readonly TempDirectory temp = new();
    private readonly string[] roots;

    /// <param name="rootNames">Folders under the temp folder, each given as one <c>--root</c>.</param>
    public CliIndex(params string[] rootNames)
    {
        roots = rootNames;
        foreach (var root in rootNames)
        {
            Directory.CreateDirectory(temp.Combine(root));
        }
    }

    /// <summary>Commands run with the shipped default encoder rather than the fast one tests name (see <see cref="CliRunner"/>).</summary>
    public bool ShippedEncoder { get; init; }

    /// <summary>Folder for files that are not in any root (sources, qpdf input and output).</summary>
    public string Scratch => Directory.CreateDirectory(temp.Combine("scratch")).FullName;

    public string PathOf(string relative) => temp.Combine(relative.Split('/'));

    /// <summary>
    /// Writes a file (creating folders), its modification time an hour back like a file that has sat on a
    /// drive: a fresh stat cannot vouch for a file (docs/detect.md, racy stats), and the scan would wait
    /// the settle time for it.
    /// </summary>
    public string Put(string relative, byte[] bytes)
    {
        var full = PathOf(relative);
        Directory.CreateDirectory(Path.GetDirectoryName(full)!);
        File.WriteAllBytes(full, bytes);
        File.SetLastWriteTimeUtc(full, DateTime.UtcNow.AddHours(-1));
        return full;
    }

    public byte[] Get(string relative) => File.ReadAllBytes(PathOf(relative));

    /// <summary>Moves a file or folder within the temp folder (a rename keeps inode and bytes).</summary>
    public void Move(string from, string to)
    {
        var target = PathOf(to);
        Directory.CreateDirectory(Path.GetDirectoryName(target)!);
        File.Move(PathOf(from), target);
    }

    public void Delete(string relative) => File.Delete(PathOf(relative));

    /// <summary>Runs a command with this store's index and roots; extra arguments come after them.</summary>
    public CliRunner.Result Run(string command, params string[] extra) => RunWith(new Dictionary<string, string>(), command, extra);

    /// <summary>As <see cref="Run"/>, with extra environment variables (a fault armed for a crash test).</summary>
    public CliRunner.Result RunWith(IReadOnlyDictionary<string, string> environment, string command, params string[] extra)
    {
        var args = new List<string> { command, "--index", "index" };
        foreach (var root in roots)
        {
            args.Add("--root");
            args.Add(root);
        }

        args.AddRange(extra);
        return CliRunner.Run(temp.Path, environment, ShippedEncoder, [.. args]);
    }

    /// <summary>Runs a command with <c>--json</c>, asserts its exit code, and returns its one JSON object.</summary>
    public JsonElement Json(string command, params string[] extra) => JsonExpecting(0, command, extra);

    public JsonElement JsonExpecting(int exitCode, string command, params string[] extra)
    {
        var result = Run(command, [.. extra, "--json"]);
        Assert.True(
            result.ExitCode == exitCode,
            $"indexkeeper {command} exited {result.ExitCode}, expected {exitCode}\nstdout: {result.Stdout}\nstderr: {result.Stderr}");
        using var json = JsonDocument.Parse(result.Stdout);
        return json.RootElement.Clone();
    }

    public void Dispose() => temp.Dispose();
}
