namespace IndexKeeper.Core.Documents;

/// <summary>
/// A rectangle in page coordinates: PDF user-space points with the origin at the bottom left of the
/// page as drawn (before /Rotate); for image documents, pixels with the same orientation.
/// </summary>
public readonly record struct PageBox(float Left, float Bottom, float Right, float Top)
{
    public float Width => Right - Left;

    public float Height => Top - Bottom;

    public static PageBox Union(PageBox a, PageBox b) =>
        new(Math.Min(a.Left, b.Left), Math.Min(a.Bottom, b.Bottom), Math.Max(a.Right, b.Right), Math.Max(a.Top, b.Top));
}
