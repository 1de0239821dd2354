using System.Security.Cryptography;

namespace IndexKeeper.Churn.Store;

/// <summary>
/// The simulated shared drive: the documents the simulator believes are on disk, by path under the root
/// ('/'-separated), and the file operations that keep disk and model in step. The model is the truth.
/// </summary>
internal sealed class StoreModel
{
    private readonly SortedDictionary<string, SimDocument> documents = new(StringComparer.Ordinal);
    private readonly string scratch;

    public StoreModel(string rootDirectory, string scratchDirectory)
    {
        RootDirectory = rootDirectory;
        scratch = scratchDirectory;
        Directory.CreateDirectory(rootDirectory);
        Directory.CreateDirectory(scratchDirectory);
    }

    public string RootDirectory { get; }

    public IReadOnlyCollection<string> Paths => documents.Keys;

    public int PageCount => documents.Values.Sum(d => d.Pages.Count);

    public SimDocument this[string path] => documents[path];

    /// <summary>What every page of every file shows, by path.</summary>
    public Dictionary<string, IReadOnlyList<ulong>> Truth() => documents.ToDictionary(d => d.Key, d => d.Value.Pages, StringComparer.Ordinal);

    public void Add(string path, SimDocument document, byte[]? bytes = null)
    {
        documents.Add(path, document);
        File.WriteAllBytes(Full(path, create: true), bytes ?? Render(document));
    }

    /// <summary>Saves the document's current state: in place (same file) or as a new file renamed over the old.</summary>
    public void Save(string path, bool inPlace)
    {
        var bytes = Render(documents[path]);
        var full = Full(path);
        if (inPlace)
        {
            File.WriteAllBytes(full, bytes);
        }
        else
        {
            var temporary = Path.Combine(Path.GetDirectoryName(full)!, "~" + Path.GetFileName(full) + ".tmp");
            File.WriteAllBytes(temporary, bytes);
            File.Move(temporary, full, overwrite: true);
        }
    }

    /// <summary>The same bytes written again: a new modification time, nothing else.</summary>
    public void ResaveIdentical(string path)
    {
        var full = Full(path);
        File.WriteAllBytes(full, File.ReadAllBytes(full));
    }

    public void Touch(string path)
    {
        var full = Full(path);
        File.SetLastWriteTimeUtc(full, File.GetLastWriteTimeUtc(full).AddSeconds(7));
    }

    public string Copy(string from, string to)
    {
        to = FreePath(to);
        File.Copy(Full(from), Full(to, create: true));
        documents.Add(to, documents[from].Clone());
        return to;
    }

    public string Move(string from, string to)
    {
        to = FreePath(to);
        File.Move(Full(from), Full(to, create: true));
        documents.Add(to, documents[from]);
        documents.Remove(from);
        return to;
    }

    public void Delete(string path)
    {
        File.Delete(Full(path));
        documents.Remove(path);
    }

    /// <summary>Moves a whole folder (one rename of the directory); returns the number of files moved.</summary>
    public int MoveFolder(string from, string to)
    {
        var moved = documents.Keys.Where(p => p.StartsWith(from + "/", StringComparison.Ordinal)).ToList();
        if (moved.Count == 0 || Directory.Exists(Full(to)))
        {
            return 0;
        }

        Directory.CreateDirectory(Path.GetDirectoryName(Full(to))!);
        Directory.Move(Full(from), Full(to));
        foreach (var path in moved)
        {
            documents.Add(to + path[from.Length..], documents[path]);
            documents.Remove(path);
        }

        return moved.Count;
    }

    /// <summary>SHA-256 of every file by path, as a file-level change detector sees the drive.</summary>
    public Dictionary<string, string> FileHashes() => documents.Keys.ToDictionary(
        p => p,
        p =>
        {
            using var stream = File.OpenRead(Full(p));
            return Convert.ToHexString(SHA256.HashData(stream));
        },
        StringComparer.Ordinal);

    public string FreePath(string path)
    {
        var candidate = path;
        var dot = path.LastIndexOf('.');
        for (var n = 2; documents.ContainsKey(candidate) || File.Exists(Full(candidate)); n++)
        {
            candidate = path[..dot] + " (" + n.ToString(System.Globalization.CultureInfo.InvariantCulture) + ")" + path[dot..];
        }

        return candidate;
    }

    private byte[] Render(SimDocument document)
    {
        var bytes = document.Render();
        return document.Extension == ".pdf" ? Qpdf.Rewrite(bytes, document.Layout, scratch) : bytes;
    }

    private string Full(string path, bool create = false)
    {
        var full = Path.Combine([RootDirectory, .. path.Split('/')]);
        if (create)
        {
            Directory.CreateDirectory(Path.GetDirectoryName(full)!);
        }

        return full;
    }
}
