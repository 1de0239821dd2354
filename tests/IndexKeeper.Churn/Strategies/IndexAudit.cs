using IndexKeeper.Core.Catalog;
using IndexKeeper.Service.Application;

namespace IndexKeeper.Churn.Strategies;

/// <summary>
/// Checks the index against the simulator's truth after a day. A page is served when its file's catalog
/// entry lists a page key at its position, that key has a live vector set under the active encoder, and
/// the key has only ever stood for this page's content. Bindings of key to content are kept across days,
/// so a key that outlived a visible change of its page is caught.
/// </summary>
internal sealed class IndexAudit
{
    private readonly Dictionary<string, ulong> bindings = new(StringComparer.Ordinal);
    private readonly Dictionary<ulong, HashSet<string>> keysOfContent = [];

    public AuditResult Check(OpenIndex session, IReadOnlyDictionary<string, IReadOnlyList<ulong>> truth, IReadOnlySet<ulong> changed)
    {
        var documents = session.Catalog.Documents.OfRoot(KeeperIndex.RootName).ToDictionary(d => d.Path, StringComparer.Ordinal);
        var live = session.Catalog.VectorSets.Live(session.Encoder.Identity.Id).ToDictionary(v => v.PageKey, v => (long)v.Length, StringComparer.Ordinal);
        long misses = 0, unserved = 0, rebound = 0, servedBytes = 0;
        var bytesByPath = new Dictionary<string, long>(StringComparer.Ordinal);
        var held = new HashSet<string>(StringComparer.Ordinal);
        foreach (var (path, pages) in truth)
        {
            var document = documents.GetValueOrDefault(path);
            var keys = document is { State: DocumentState.Live } && document.PageKeys.Count == pages.Count ? document.PageKeys : null;
            var before = servedBytes;
            for (var i = 0; i < pages.Count; i++)
            {
                var served = false;
                if (keys is not null)
                {
                    var key = keys[i];
                    held.Add(key);
                    if (!bindings.TryAdd(key, pages[i]) && bindings[key] != pages[i])
                    {
                        rebound++;
                    }
                    else if (live.TryGetValue(key, out var length))
                    {
                        served = true;
                        servedBytes += length;
                    }

                    if (!keysOfContent.TryGetValue(pages[i], out var known))
                    {
                        keysOfContent[pages[i]] = known = new HashSet<string>(StringComparer.Ordinal);
                    }

                    known.Add(key);
                }

                if (!served)
                {
                    unserved++;
                    if (changed.Contains(pages[i]))
                    {
                        misses++;
                    }
                }
            }

            bytesByPath[path] = servedBytes - before;
        }

        var ghostPages = documents.Values.Where(d => !truth.ContainsKey(d.Path)).Sum(d => (long)d.PageKeys.Count);
        var staleVectors = live.Keys.Count(k => !held.Contains(k));
        var contents = truth.Values.SelectMany(p => p).ToHashSet();
        var splitContents = contents.Count(c => keysOfContent.TryGetValue(c, out var keys) && keys.Count > 1);
        return new AuditResult(misses, unserved, rebound, staleVectors + ghostPages, splitContents, servedBytes, contents.Count, held.Count, live.Values.Sum(), bytesByPath);
    }
}
