using UglyToad.PdfPig.Content;
using UglyToad.PdfPig.Core;
using UglyToad.PdfPig.DocumentLayoutAnalysis.WordExtractor;
using UglyToad.PdfPig.Util;

namespace IndexKeeper.Core.Documents.Pdf;

/// <summary>
/// Words of a loaded page with their boxes in page coordinates (see <see cref="PageBox"/>): the parser
/// reports letters on the page as displayed (rotated, relative to its crop box); this turns them back
/// into unrotated user space measured from the lower-left corner of the visible box.
/// </summary>
internal static class PdfWordExtractor
{
    public static List<PageWord> Extract(Page page, PdfPageCanonicalizer.Rectangle visible)
    {
        // The default extractor is a few times faster but splits rotated text into single letters;
        // the nearest-neighbour one groups letters of any orientation.
        IWordExtractor extractor = page.Letters.All(l => l.TextOrientation == TextOrientation.Horizontal)
            ? DefaultWordExtractor.Instance
            : NearestNeighbourWordExtractor.Instance;
        var crop = page.CropBox.Bounds;
        var rotation = PdfPageCanonicalizer.NormalRotation(page.Rotation.Value);
        var words = new List<PageWord>();
        foreach (var word in page.GetWords(extractor))
        {
            if (string.IsNullOrWhiteSpace(word.Text))
            {
                continue;
            }

            var b = word.BoundingBox;
            PdfPoint[] corners = [b.BottomLeft, b.BottomRight, b.TopLeft, b.TopRight];
            double left = double.MaxValue, bottom = double.MaxValue, right = double.MinValue, top = double.MinValue;
            foreach (var corner in corners)
            {
                var (x, y) = Unrotate(corner.X, corner.Y, crop.Width, crop.Height, rotation);
                x += crop.Left - visible.Left;
                y += crop.Bottom - visible.Bottom;
                left = Math.Min(left, x);
                bottom = Math.Min(bottom, y);
                right = Math.Max(right, x);
                top = Math.Max(top, y);
            }

            words.Add(new PageWord(word.Text, new PageBox((float)left, (float)bottom, (float)right, (float)top)));
        }

        return words;
    }

    /// <summary>
    /// Inverse of the displayed orientation: a clockwise /Rotate of 90 shows user point (x, y) of a box
    /// w wide and h high at (y, w - x), 180 at (w - x, h - y), 270 at (h - y, x).
    /// </summary>
    public static (double X, double Y) Unrotate(double x, double y, double width, double height, int rotation) => rotation switch
    {
        90 => (width - y, x),
        180 => (width - x, height - y),
        270 => (y, height - x),
        _ => (x, y),
    };
}
