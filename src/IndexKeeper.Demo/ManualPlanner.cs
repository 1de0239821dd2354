namespace IndexKeeper.Demo;

/// <summary>Plans the pages of a manual: cover, contents, numbered sections of 2 or more pages of mixed
/// kinds, and appendices, each page with its own seed.</summary>
internal static class ManualPlanner
{
    private const int AppendixPages = 2;

    /// <summary>The pages of a manual in their printed order.</summary>
    public static IReadOnlyList<ManualPage> Plan(ManualSpec spec, DemoRandom random)
    {
        var words = DemoVocabulary.For(spec.Topic);
        var titles = SectionTitles(words);
        int bodyPages = spec.PageCount - 2 - AppendixPages;
        int sectionCount = Math.Clamp(bodyPages / 4, 4, titles.Count);
        var lengths = Enumerable.Repeat(2, sectionCount).ToArray();
        for (int extra = bodyPages - 2 * sectionCount; extra > 0; extra--)
        {
            lengths[random.Next(sectionCount)]++;
        }

        var pages = new List<ManualPage>
        {
            new("i", ManualPageKind.Cover, 0, "", false, random.NextUInt64()),
            new("ii", ManualPageKind.Contents, 0, "", false, random.NextUInt64()),
        };
        for (int section = 1; section <= sectionCount; section++)
        {
            for (int page = 1; page <= lengths[section - 1]; page++)
            {
                var kind = page == 1 ? ManualPageKind.Text : BodyKind(random);
                pages.Add(new(SectionLabel(section, page), kind, section, titles[section - 1], page == 1, random.NextUInt64()));
            }
        }

        // The first photograph is embedded as a PNG, which the builder decodes and stores with Flate; the
        // others as JPEGs kept as they are. PNGs are the fewer because the builder decodes them slowly.
        int firstPhoto = pages.FindIndex(page => page.Kind == ManualPageKind.PhotoJpeg);
        if (firstPhoto >= 0)
        {
            pages[firstPhoto] = pages[firstPhoto] with { Kind = ManualPageKind.PhotoPng };
        }

        for (int page = 1; page <= AppendixPages; page++)
        {
            pages.Add(new("A-" + DemoNumber.Integer(page), ManualPageKind.Appendix, sectionCount + 1, "Appendix", page == 1, random.NextUInt64()));
        }

        return pages;
    }

    public static string SectionLabel(int section, int page) => DemoNumber.Integer(section) + "-" + DemoNumber.Integer(page);

    private static List<string> SectionTitles(TopicWords words)
    {
        // Topic sections sit after the description, as a reader expects the plant before its upkeep.
        var titles = new List<string>(DemoVocabulary.CommonSections);
        titles.InsertRange(3, words.Sections);
        return titles;
    }

    private static ManualPageKind BodyKind(DemoRandom random) => random.Next(100) switch
    {
        < 36 => ManualPageKind.Text,
        < 56 => ManualPageKind.Procedure,
        < 72 => ManualPageKind.Table,
        < 86 => ManualPageKind.Schematic,
        _ => ManualPageKind.PhotoJpeg,
    };
}
