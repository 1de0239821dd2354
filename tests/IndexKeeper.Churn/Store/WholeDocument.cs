using IndexKeeper.Demo;

namespace IndexKeeper.Churn.Store;

/// <summary>
/// A document drawn from one seeded stream (a report, a form, a drawing, a scan): a revision redraws
/// every page, so pages are only ever new all together. The stream is named after the document's
/// identity and revision, and so is every page's content id.
/// </summary>
internal sealed class WholeDocument : SimDocument
{
    private readonly string kind;
    private readonly string identity;
    private readonly int pageCount;
    private readonly string extension;
    private readonly Func<DemoRandom, int, byte[]> render;
    private readonly bool hasMetadata;
    private string revision = "r0";

    /// <param name="render">Draws the bytes from the revision's stream and the metadata revision.</param>
    public WholeDocument(string kind, string identity, int pageCount, string extension, bool hasMetadata, Func<DemoRandom, int, byte[]> render)
    {
        this.kind = kind;
        this.identity = identity;
        this.pageCount = pageCount;
        this.extension = extension;
        this.hasMetadata = hasMetadata;
        this.render = render;
    }

    public override string Kind => kind;

    public override string Extension => extension;

    public override bool HasMetadata => hasMetadata;

    public override IReadOnlyList<ulong> Pages =>
        Enumerable.Range(0, pageCount).Select(i => ContentId.Of(kind, identity, revision, i.ToString(System.Globalization.CultureInfo.InvariantCulture))).ToList();

    public override byte[] Render() => render(DemoRandom.For(0, kind + "/" + identity + "/" + revision), MetadataRevision);

    public override SimDocument Clone() =>
        new WholeDocument(kind, identity, pageCount, extension, hasMetadata, render) { revision = revision, Layout = Layout, MetadataRevision = MetadataRevision };

    public override void Revise(string revisionName) => revision = revisionName;
}
