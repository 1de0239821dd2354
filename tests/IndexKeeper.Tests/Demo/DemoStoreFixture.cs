using System.Security.Cryptography;
using IndexKeeper.Demo;

namespace IndexKeeper.Tests.Demo;

/// <summary>
/// Generates the demo store twice (generation is the costly part): the first copy stays as generated for
/// the read-only checks; the second is compared byte for byte with the first, then gets the day-two
/// changes, with what it looked like before them kept for comparison.
/// </summary>
public sealed class DemoStoreFixture : IDisposable
{
    private readonly string scratch = Path.Combine(Path.GetTempPath(), "indexkeeper-demo-" + Guid.NewGuid().ToString("N"));

    public DemoStoreFixture()
    {
        FirstDirectory = Path.Combine(scratch, "first");
        SecondDirectory = Path.Combine(scratch, "second");
        First = DemoStore.Generate(FirstDirectory);
        var second = DemoStore.Generate(SecondDirectory);
        SecondInfo = second;
        FirstHashes = HashAll(FirstDirectory);
        SecondHashesBefore = HashAll(SecondDirectory);
        SignaturesBefore = SignaturesOf(SecondDirectory);
        TimesBefore = Directory.EnumerateFiles(SecondDirectory, "*", SearchOption.AllDirectories)
            .ToDictionary(path => StorePath(SecondDirectory, path), File.GetLastWriteTimeUtc);
        Changes = DemoStore.ApplyDayTwoChanges(SecondDirectory);
        SignaturesAfter = SignaturesOf(SecondDirectory);
    }

    public string FirstDirectory { get; }

    public string SecondDirectory { get; }

    public DemoStoreInfo First { get; }

    public DemoStoreInfo SecondInfo { get; }

    /// <summary>SHA-256 of every file by store path ("root/relative").</summary>
    public IReadOnlyDictionary<string, string> FirstHashes { get; }

    public IReadOnlyDictionary<string, string> SecondHashesBefore { get; }

    public IReadOnlyDictionary<string, DateTime> TimesBefore { get; }

    /// <summary>Page signatures of every document of the second store before and after day two.</summary>
    public IReadOnlyDictionary<string, IReadOnlyList<string>> SignaturesBefore { get; }

    public IReadOnlyDictionary<string, IReadOnlyList<string>> SignaturesAfter { get; }

    public IReadOnlyList<DemoChange> Changes { get; }

    public static string StorePath(string directory, string fullPath) =>
        Path.GetRelativePath(directory, fullPath).Replace(Path.DirectorySeparatorChar, '/');

    public static string FullPath(string directory, string storePath) =>
        Path.Combine([directory, .. storePath.Split('/')]);

    public void Dispose() => Directory.Delete(scratch, recursive: true);

    private static Dictionary<string, string> HashAll(string directory) =>
        Directory.EnumerateFiles(directory, "*", SearchOption.AllDirectories)
            .ToDictionary(path => StorePath(directory, path), path => Convert.ToHexString(SHA256.HashData(File.ReadAllBytes(path))));

    private static Dictionary<string, IReadOnlyList<string>> SignaturesOf(string directory) =>
        Directory.EnumerateFiles(directory, "*", SearchOption.AllDirectories)
            .Where(path => Path.GetFileName(path) != DemoManifest.FileName)
            .ToDictionary(path => StorePath(directory, path), PageSignatures.Of);
}
