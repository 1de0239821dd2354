using UglyToad.PdfPig.Tokens;

namespace IndexKeeper.Core.Documents.Pdf;

/// <summary>
/// The resource dictionaries a content stream sees: its own first, then those of the forms and page
/// that draw it. A name missing from a form's own resources is looked up outwards, as the parser does.
/// </summary>
internal sealed class ResourceScope
{
    private readonly ResourceScope? outer;
    private readonly DictionaryToken? resources;

    private ResourceScope(ResourceScope? outer, DictionaryToken? resources, int level)
    {
        this.outer = outer;
        this.resources = resources;
        Level = level;
    }

    /// <summary>0 for the page (or an annotation appearance), one more for each form inside.</summary>
    public int Level { get; }

    public DictionaryToken? Resources => resources;

    public static ResourceScope Root(DictionaryToken? resources) => new(null, resources, 0);

    /// <summary>The scope of a form drawn here; a form without resources of its own shares this one's.</summary>
    public ResourceScope Inner(DictionaryToken? formResources) =>
        formResources is null ? this : new ResourceScope(this, formResources, Level + 1);

    /// <summary>The entry <paramref name="name"/> of the category (Font, XObject, …) and the level it was found at.</summary>
    public (IToken? Value, int Level) Find(PdfObjectResolver resolver, string category, string name)
    {
        for (var scope = this; scope is not null; scope = scope.outer)
        {
            if (resolver.Get<DictionaryToken>(scope.resources, category) is { } entries
                && entries.Data.TryGetValue(name, out var value))
            {
                return (value, scope.Level);
            }
        }

        return (null, -1);
    }
}
