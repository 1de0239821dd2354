using System.Globalization;
using IndexKeeper.Demo;

namespace IndexKeeper.Churn.Store;

/// <summary>
/// The people of the simulated drive at work: the first day's store, then each day's changes drawn from
/// the day's own seeded stream. Every change goes through <see cref="StoreModel"/>, which keeps the truth.
/// </summary>
internal sealed class ChangeScript(ChurnProfile profile, int seed, StoreModel store)
{
    private static readonly string[] CopyFolders = ["final", "v2", "archive"];
    private static readonly string[] RenameMarks = [" (checked)", " - old", " signed", " for review"];

    private readonly DocumentFactory factory = new(seed);

    /// <summary>Writes the first day's store.</summary>
    public void Generate()
    {
        var planned = new List<(string Folder, string Name, SimDocument Document)>();
        planned.AddRange(profile.ManualPages.Select(factory.Manual));
        var random = factory.Random("store");
        planned.AddRange(Enumerable.Range(0, profile.Decks).Select(_ => factory.Deck(random.Next(10, 40))));
        planned.AddRange(Enumerable.Range(0, profile.Reports).Select(_ => factory.Report(random.Next(3, 10))));
        planned.AddRange(Enumerable.Range(0, profile.Forms).Select(_ => factory.Form()));
        planned.AddRange(Enumerable.Range(0, profile.Drawings).Select(_ => factory.Drawing()));
        planned.AddRange(Enumerable.Range(0, profile.Scans).Select(_ => factory.Scan()));
        AddAll(planned);
    }

    /// <summary>Makes one day's changes; returns how many of each kind were made.</summary>
    public SortedDictionary<string, int> Apply(int day)
    {
        var counts = new SortedDictionary<string, int>(StringComparer.Ordinal);
        var random = factory.Random("day/" + day.ToString(CultureInfo.InvariantCulture));
        var type = profile.DayType(day);
        if (type == "weekend")
        {
            for (var i = random.Next(0, 3); i > 0; i--)
            {
                Touch(random, counts);
            }

            return counts;
        }

        var scale = profile.WorkingDayEdits;
        Repeat(random.Next(scale, 2 * scale + 1), () => EditPages(random, counts));
        Repeat(random.Next(1, scale + 1), () => ResaveWithoutChange(random, counts));
        Repeat(random.Next(0, scale / 2 + 1), () => EditMetadata(random, counts));
        Repeat(random.Next(1, scale / 2 + 2), () => CopyToFolder(random, counts));
        Repeat(random.Next(0, scale / 2 + 1), () => Rename(random, counts));
        Repeat(random.Next(0, scale / 3 + 1), () => MoveFile(random, counts));
        Repeat(random.Next(0, scale / 2 + 1), () => InsertOrDeletePages(random, counts));
        Repeat(random.Next(0, scale / 3 + 1), () => DeleteFile(random, counts));
        Repeat(random.Next(0, scale / 3 + 1), () => Revise(random, counts, day));
        Repeat(random.Next(1, scale / 2 + 2), () => AddSmallFile(random, counts));
        Touch(random, counts);
        if (type == "bulk drop")
        {
            BulkDrop(random, counts, day);
        }
        else if (type == "reorganisation")
        {
            Reorganise(random, counts, day);
        }

        return counts;
    }

    private void AddAll(List<(string Folder, string Name, SimDocument Document)> planned)
    {
        // Rendering is the slow part and depends only on the document, so it runs in parallel; files are added in order.
        var bytes = new byte[planned.Count][];
        Parallel.For(0, planned.Count, new ParallelOptions { MaxDegreeOfParallelism = Environment.ProcessorCount }, i => bytes[i] = planned[i].Document.Render());
        for (var i = 0; i < planned.Count; i++)
        {
            store.Add(store.FreePath(planned[i].Folder + "/" + planned[i].Name), planned[i].Document, bytes[i]);
        }
    }

    private static void Repeat(int times, Action action)
    {
        for (var i = 0; i < times; i++)
        {
            action();
        }
    }

    private static void Count(SortedDictionary<string, int> counts, string kind) => counts[kind] = counts.GetValueOrDefault(kind) + 1;

    private string? Pick(DemoRandom random, Func<SimDocument, bool> where)
    {
        var candidates = store.Paths.Where(p => where(store[p])).ToList();
        return candidates.Count == 0 ? null : random.Pick(candidates);
    }

    private static PdfLayout Layout(DemoRandom random) => random.Next(100) switch
    {
        < 60 => PdfLayout.AsBuilt,
        < 85 => PdfLayout.ObjectStreams,
        _ => PdfLayout.Linearized,
    };

    private void EditPages(DemoRandom random, SortedDictionary<string, int> counts)
    {
        if (Pick(random, d => d.PageEditable) is not { } path)
        {
            return;
        }

        var document = store[path];
        var editable = document.EditablePages();
        for (var edits = random.Next(1, 4); edits > 0; edits--)
        {
            document.EditPage(random.Pick(editable), random.NextUInt64());
        }

        document.Layout = Layout(random);
        store.Save(path, inPlace: random.Chance(50));
        Count(counts, document.Layout == PdfLayout.AsBuilt ? "page edit, saved" : "page edit, saved and restructured by qpdf");
    }

    private void ResaveWithoutChange(DemoRandom random, SortedDictionary<string, int> counts)
    {
        if (Pick(random, d => d.Extension == ".pdf") is not { } path)
        {
            return;
        }

        if (random.Chance(50))
        {
            store.ResaveIdentical(path);
            Count(counts, "re-save, same bytes");
            return;
        }

        var document = store[path];
        document.Layout = document.Layout == PdfLayout.ObjectStreams ? PdfLayout.Linearized : PdfLayout.ObjectStreams;
        store.Save(path, inPlace: false);
        Count(counts, "re-save restructured by qpdf, no visible change");
    }

    private void EditMetadata(DemoRandom random, SortedDictionary<string, int> counts)
    {
        if (Pick(random, d => d.HasMetadata) is not { } path)
        {
            return;
        }

        store[path].MetadataRevision++;
        store.Save(path, inPlace: random.Chance(50));
        Count(counts, "metadata edit");
    }

    private void CopyToFolder(DemoRandom random, SortedDictionary<string, int> counts)
    {
        if (Pick(random, _ => true) is not { } path)
        {
            return;
        }

        var slash = path.LastIndexOf('/');
        store.Copy(path, path[..slash] + "/" + random.Pick(CopyFolders) + path[slash..]);
        Count(counts, "copy into another folder");
    }

    private void Rename(DemoRandom random, SortedDictionary<string, int> counts)
    {
        if (Pick(random, _ => true) is not { } path)
        {
            return;
        }

        var dot = path.LastIndexOf('.');
        store.Move(path, path[..dot] + random.Pick(RenameMarks) + path[dot..]);
        Count(counts, "rename");
    }

    private void MoveFile(DemoRandom random, SortedDictionary<string, int> counts)
    {
        if (Pick(random, _ => true) is not { } path)
        {
            return;
        }

        var folders = store.Paths.Select(p => p[..p.LastIndexOf('/')]).Distinct(StringComparer.Ordinal).ToList();
        store.Move(path, random.Pick(folders) + path[path.LastIndexOf('/')..]);
        Count(counts, "move to another folder");
    }

    private void InsertOrDeletePages(DemoRandom random, SortedDictionary<string, int> counts)
    {
        if (Pick(random, d => d.PageEditable) is not { } path)
        {
            return;
        }

        var document = store[path];
        var deletable = document.DeletablePages();
        if (random.Chance(50) && deletable.Count > 2)
        {
            document.DeletePage(random.Pick(deletable));
            Count(counts, "page deleted");
        }
        else
        {
            var anchors = document is ManualDocument manual ? manual.InsertionAnchors() : Enumerable.Range(0, document.Pages.Count).ToList();
            for (var pages = random.Next(1, 3); pages > 0; pages--)
            {
                document.InsertPage(random.Pick(anchors), random.NextUInt64());
            }

            Count(counts, "pages inserted");
        }

        document.Layout = Layout(random);
        store.Save(path, inPlace: random.Chance(50));
    }

    private void DeleteFile(DemoRandom random, SortedDictionary<string, int> counts)
    {
        if (Pick(random, _ => true) is not { } path)
        {
            return;
        }

        store.Delete(path);
        Count(counts, "file deleted");
    }

    private void Revise(DemoRandom random, SortedDictionary<string, int> counts, int day)
    {
        if (Pick(random, d => d.Kind is "report" or "form" or "scan") is not { } path)
        {
            return;
        }

        store[path].Revise("day" + day.ToString(CultureInfo.InvariantCulture) + "-" + random.NextUInt64().ToString(CultureInfo.InvariantCulture));
        store.Save(path, inPlace: random.Chance(50));
        Count(counts, "new revision, every page changed");
    }

    private void AddSmallFile(DemoRandom random, SortedDictionary<string, int> counts)
    {
        var (folder, name, document) = random.Next(3) switch
        {
            0 => factory.Form(),
            1 => factory.Scan(),
            _ => factory.Report(random.Next(3, 8)),
        };
        store.Add(store.FreePath(folder + "/" + name), document);
        Count(counts, "new file");
    }

    private void Touch(DemoRandom random, SortedDictionary<string, int> counts)
    {
        if (Pick(random, _ => true) is { } path)
        {
            store.Touch(path);
            Count(counts, "touched, same bytes");
        }
    }

    /// <summary>A handover package lands at once: a long manual, a deck, forms and scans in a new folder.</summary>
    private void BulkDrop(DemoRandom random, SortedDictionary<string, int> counts, int day)
    {
        var folder = "handover/package-" + day.ToString("D2", CultureInfo.InvariantCulture);
        var planned = new List<(string Folder, string Name, SimDocument Document)>
        {
            factory.Manual(profile.ManualPages[random.Next(profile.ManualPages.Count)] / 2 + 20),
            factory.Deck(random.Next(10, 30)),
        };
        planned.AddRange(Enumerable.Range(0, 2 + profile.Forms / 4).Select(_ => factory.Form()));
        planned.AddRange(Enumerable.Range(0, 2 + profile.Scans / 4).Select(_ => factory.Scan()));
        AddAll(planned.Select(p => (folder + "/" + p.Folder.Replace('/', '-'), p.Name, p.Document)).ToList());
        counts["bulk drop: new files"] = counts.GetValueOrDefault("bulk drop: new files") + planned.Count;
    }

    /// <summary>A tidy-up: a whole folder moved into the archive, another copied there, a few renames.</summary>
    private void Reorganise(DemoRandom random, SortedDictionary<string, int> counts, int day)
    {
        var folders = store.Paths.Select(p => p[..p.LastIndexOf('/')]).Where(f => !f.StartsWith("archive/", StringComparison.Ordinal)).Distinct(StringComparer.Ordinal).ToList();
        var moved = random.Pick(folders);
        var files = store.MoveFolder(moved, "archive/" + day.ToString("D2", CultureInfo.InvariantCulture) + "/" + moved.Replace('/', '-'));
        counts["whole folder moved (files)"] = counts.GetValueOrDefault("whole folder moved (files)") + files;
        var copied = random.Pick(folders.Where(f => f != moved).ToList());
        foreach (var path in store.Paths.Where(p => p.StartsWith(copied + "/", StringComparison.Ordinal)).ToList())
        {
            store.Copy(path, "archive/copies-" + day.ToString("D2", CultureInfo.InvariantCulture) + "/" + path);
            Count(counts, "copy into another folder");
        }

        Repeat(random.Next(2, 5), () => Rename(random, counts));
    }
}
