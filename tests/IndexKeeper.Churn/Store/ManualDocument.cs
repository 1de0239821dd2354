using System.Globalization;
using IndexKeeper.Demo;

namespace IndexKeeper.Churn.Store;

/// <summary>
/// An operation and maintenance manual: the demo's manual builder draws each page from its own record
/// (label, kind, section, seed), so one page can be edited, inserted or deleted and the others stay as
/// they were. The contents page shows only the section openings, which no edit here moves.
/// </summary>
internal sealed class ManualDocument : SimDocument
{
    private readonly ManualSpec spec;
    private readonly List<ManualPage> pages;

    public ManualDocument(ManualSpec spec, IEnumerable<ManualPage> pages)
    {
        this.spec = spec;
        this.pages = pages.ToList();
    }

    public override string Kind => "manual";

    public override bool PageEditable => true;

    public override bool HasMetadata => true;

    public override IReadOnlyList<ulong> Pages => pages.Select(Content).ToList();

    public override byte[] Render()
    {
        var info = ManualBuilder.Info(spec);
        if (MetadataRevision > 0)
        {
            info = info with
            {
                Title = info.Title + " (document control note " + MetadataRevision.ToString(CultureInfo.InvariantCulture) + ")",
                ModifiedDate = DemoPdfInfo.Date(new DateOnly(2026, 3, MetadataRevision % 28 + 1), new TimeOnly(12, 0)),
            };
        }

        return ManualBuilder.Render(spec, pages, info);
    }

    public override SimDocument Clone() => new ManualDocument(spec, pages) { Layout = Layout, MetadataRevision = MetadataRevision };

    public override void Revise(string revisionName)
    {
        var random = DemoRandom.For(0, "manual-revision/" + spec.Code + "/" + revisionName);
        for (var i = 0; i < pages.Count; i++)
        {
            if (pages[i].Kind != ManualPageKind.Contents)
            {
                pages[i] = pages[i] with { Seed = random.NextUInt64() };
            }
        }
    }

    public override IReadOnlyList<int> EditablePages() =>
        Enumerable.Range(0, pages.Count).Where(i => pages[i].Kind != ManualPageKind.Contents).ToList();

    public override void EditPage(int index, ulong seed) => pages[index] = pages[index] with { Seed = seed };

    public override void InsertPage(int after, ulong seed)
    {
        var anchor = pages[after];
        var label = anchor.Label + "A";
        while (pages.Any(p => p.Label == label))
        {
            label += "A";
        }

        pages.Insert(after + 1, new ManualPage(label, ManualPageKind.Text, anchor.Section, anchor.SectionTitle, false, seed));
    }

    /// <summary>Body pages that open no section: removing one leaves the contents page as it was.</summary>
    public override IReadOnlyList<int> DeletablePages() =>
        Enumerable.Range(0, pages.Count).Where(i => pages[i].Section > 0 && !pages[i].OpensSection && pages[i].Kind != ManualPageKind.Appendix).ToList();

    /// <summary>Pages after which a new body page may go.</summary>
    public IReadOnlyList<int> InsertionAnchors() =>
        Enumerable.Range(0, pages.Count).Where(i => pages[i].Section > 0 && pages[i].Kind != ManualPageKind.Appendix).ToList();

    public override void DeletePage(int index) => pages.RemoveAt(index);

    private ulong Content(ManualPage page) => page.Kind == ManualPageKind.Contents
        ? ContentId.Of(["manual-contents", SpecKey(), .. pages.Where(p => p.OpensSection).OrderBy(p => p.Section).Select(p => p.Label + "/" + p.SectionTitle + "/" + p.Kind)])
        : ContentId.Of("manual-page", SpecKey(), page.ToString());

    private string SpecKey() => spec.Code + "/" + spec.Title + "/" + spec.Topic + "/" + spec.Site + "/" + spec.Revision + "/" + spec.Author + "/" + spec.Issued.ToString("O", CultureInfo.InvariantCulture);
}
