using Cloud.Unum.USearch;

namespace IndexKeeper.Core.Search;

/// <summary>
/// The single-vector index that finds candidate pages by their fixed dimensional encodings: an HNSW graph
/// (Malkov and Yashunin, IEEE TPAMI 2020) from the USearch package, inner product on float16. Keys are the
/// serving view's page ids. Not safe for a write beside any other call: the serving view's lock orders them.
/// </summary>
internal sealed class CandidateGraph : IDisposable
{
    // Edges per node and the breadth of the search when adding and when querying: the package's usual
    // values, widened for querying because the re-rank wants a few hundred candidates (common practice).
    private const ulong Connectivity = 32;
    private const ulong ExpansionAdd = 256;
    private const ulong ExpansionSearch = 1024;

    private readonly USearchIndex index;

    private CandidateGraph(USearchIndex index, bool readOnly)
    {
        this.index = index;
        ReadOnly = readOnly;
    }

    /// <summary>Opened over a file without loading it: searches only.</summary>
    public bool ReadOnly { get; }

    public long Count => (long)index.Size();

    public static CandidateGraph Create(int length) =>
        new(new USearchIndex(MetricKind.Cos, ScalarKind.Float16, (ulong)length, Connectivity, ExpansionAdd, ExpansionSearch, false), readOnly: false);

    /// <summary>Loads a saved graph into memory (<paramref name="mapOnly"/> false: it can change) or maps it read-only.</summary>
    public static CandidateGraph Open(string path, bool mapOnly) => new(new USearchIndex(path, mapOnly), mapOnly);

    public void Add(ulong id, float[] encoding)
    {
        RefuseIfReadOnly();
        index.Add(id, encoding);
    }

    public void Remove(ulong id)
    {
        RefuseIfReadOnly();
        index.Remove(id);
    }

    /// <summary>Ids of the <paramref name="count"/> encodings with the largest dot product with <paramref name="query"/>, best first.</summary>
    public ulong[] Nearest(float[] query, int count)
    {
        if (index.Size() == 0)
        {
            return [];
        }

        var found = index.Search(query, count, out ulong[] keys, out float[] _);
        return found == keys.Length ? keys : keys[..found];
    }

    /// <summary>Writes the graph to <paramref name="path"/>; a failed write (full disk, I/O error) is an <see cref="IOException"/>.</summary>
    public void Save(string path)
    {
        try
        {
            index.Save(path);
        }
        catch (Cloud.Unum.USearch.USearchException ex)
        {
            // The native library reports a failed write only as its own exception ("Failed to serialize into stream").
            throw new IOException($"The candidate graph could not be written to '{path}': {ex.Message}", ex);
        }
    }

    public void Dispose() => index.Dispose();

    private void RefuseIfReadOnly()
    {
        if (ReadOnly)
        {
            throw new InvalidOperationException("This candidate graph is mapped from a file for reading only.");
        }
    }
}
