using IndexKeeper.Core.Documents;
using IndexKeeper.Core.Documents.Pdf;

namespace IndexKeeper.Core.Encoding.PageImages;

/// <summary>
/// The page region each patch of the page graph's input shows. Patches are numbered row by row from the
/// top left of the input; a patch that shows only padding has no region and its vector is dropped. Regions
/// are in page coordinates (<see cref="PageBox"/>: unrotated, origin at the bottom left of the visible box).
/// </summary>
internal static class PatchGrid
{
    /// <summary>The patches that show part of the page, with their regions, in patch order.</summary>
    /// <param name="pageWidth">Width of the page before rotation, in page units.</param>
    /// <param name="pageHeight">Height of the page before rotation.</param>
    /// <param name="rotation">Clockwise rotation the raster was drawn with: 0, 90, 180 or 270.</param>
    public static List<(int Patch, PageBox Region)> Regions(
        int inputWidth, int inputHeight, int patchSize, PagePlacement placement, float pageWidth, float pageHeight, int rotation)
    {
        var columns = inputWidth / patchSize;
        var rows = inputHeight / patchSize;

        // The raster shows the page as displayed: turned a quarter, its sides swap.
        var quarter = rotation is 90 or 270;
        var shownWidth = quarter ? pageHeight : pageWidth;
        var shownHeight = quarter ? pageWidth : pageHeight;
        var unitsPerPixelX = shownWidth / placement.SourceWidth;
        var unitsPerPixelY = shownHeight / placement.SourceHeight;
        var result = new List<(int, PageBox)>(rows * columns);
        for (var r = 0; r < rows; r++)
        {
            var (top, bottom) = placement.SourceY(r * patchSize, (r + 1) * patchSize);
            for (var c = 0; c < columns; c++)
            {
                var (left, right) = placement.SourceX(c * patchSize, (c + 1) * patchSize);
                if (right <= left || bottom <= top)
                {
                    continue;
                }

                // Raster pixels (y down) to displayed page units (y up), then undo the rotation.
                var (x1, y1) = PdfWordExtractor.Unrotate(left * unitsPerPixelX, shownHeight - (top * unitsPerPixelY), pageWidth, pageHeight, rotation);
                var (x2, y2) = PdfWordExtractor.Unrotate(right * unitsPerPixelX, shownHeight - (bottom * unitsPerPixelY), pageWidth, pageHeight, rotation);
                result.Add(((r * columns) + c, new PageBox((float)Math.Min(x1, x2), (float)Math.Min(y1, y2), (float)Math.Max(x1, x2), (float)Math.Max(y1, y2))));
            }
        }

        return result;
    }
}
