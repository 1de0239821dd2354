using IndexKeeper.Core.Documents;

namespace IndexKeeper.Tests.Documents;

/// <summary>A scratch folder per test, with helpers to read files through the document reader.</summary>
public sealed class TempFolder : IDisposable
{
    private int counter;

    public TempFolder() => Path = Directory.CreateTempSubdirectory("indexkeeper-documents-").FullName;

    public string Path { get; }

    public string PathOf(string name) => System.IO.Path.Combine(Path, name);

    public string Write(string name, byte[] bytes)
    {
        var path = PathOf(name);
        File.WriteAllBytes(path, bytes);
        return path;
    }

    /// <summary>Reads <paramref name="file"/> with the real reader (written under a neutral name: the reader must not need an extension).</summary>
    public DocumentContent Read(byte[] file, ReadLimits? limits = null)
    {
        var path = Write($"document-{Interlocked.Increment(ref counter)}.bin", file);
        return DocumentReaderFactory.Create().Read(path, limits ?? ReadLimits.Default, CancellationToken.None);
    }

    public List<string> Keys(byte[] file) => Read(file).Pages.Select(p => p.Key.Hex).ToList();

    public DocumentReadException ReadFails(byte[] file, ReadLimits? limits = null) =>
        Assert.Throws<DocumentReadException>(() => Read(file, limits));

    public void Dispose() => Directory.Delete(Path, recursive: true);
}
