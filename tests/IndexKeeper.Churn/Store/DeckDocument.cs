namespace IndexKeeper.Churn.Store;

/// <summary>A slide deck: slides edited, inserted and deleted one at a time (never the title slide).</summary>
internal sealed class DeckDocument(DeckSpec spec, IEnumerable<ulong> slideSeeds) : SimDocument
{
    private readonly List<ulong> slides = slideSeeds.ToList();

    public override string Kind => "deck";

    public override bool PageEditable => true;

    public override bool HasMetadata => true;

    public override IReadOnlyList<ulong> Pages =>
        slides.Select((seed, i) => ContentId.Of("deck-slide", spec.ToString(), i == 0 ? "title" : "body", seed.ToString(System.Globalization.CultureInfo.InvariantCulture))).ToList();

    public override byte[] Render() => SlideDeckBuilder.Render(spec, slides, MetadataRevision);

    public override SimDocument Clone() => new DeckDocument(spec, slides) { Layout = Layout, MetadataRevision = MetadataRevision };

    public override void Revise(string revisionName)
    {
        var random = IndexKeeper.Demo.DemoRandom.For(0, "deck-revision/" + spec.Code + "/" + revisionName);
        for (var i = 0; i < slides.Count; i++)
        {
            slides[i] = random.NextUInt64();
        }
    }

    public override void EditPage(int index, ulong seed) => slides[index] = seed;

    public override void InsertPage(int after, ulong seed) => slides.Insert(after + 1, seed);

    public override IReadOnlyList<int> DeletablePages() => Enumerable.Range(1, Math.Max(0, slides.Count - 2)).ToList();

    public override void DeletePage(int index) => slides.RemoveAt(index);
}
