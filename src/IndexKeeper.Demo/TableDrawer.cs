namespace IndexKeeper.Demo;

/// <summary>Tables ruled with lines: a shaded header row, wrapped cell text, a grid of rules.</summary>
internal static class TableDrawer
{
    private const double Padding = 3;

    /// <summary>Height the table would take, to decide whether it fits before drawing.</summary>
    public static double Measure(PageWriter page, IReadOnlyList<double> columns, IReadOnlyList<string> header, IReadOnlyList<IReadOnlyList<string>> rows, double size)
    {
        double height = RowHeight(page, columns, header, size, bold: true);
        foreach (var row in rows)
        {
            height += RowHeight(page, columns, row, size, bold: false);
        }

        return height;
    }

    /// <summary>Draws the table with its top edge at <paramref name="top"/>; returns the y of its bottom edge.</summary>
    public static double Draw(PageWriter page, double left, double top, IReadOnlyList<double> columns, IReadOnlyList<string> header, IReadOnlyList<IReadOnlyList<string>> rows, double size = 8.5)
    {
        double width = columns.Sum();
        double headerHeight = RowHeight(page, columns, header, size, bold: true);
        page.FillColour(222, 230, 238);
        page.Rectangle(left, top - headerHeight, width, headerHeight, 0.5, fill: true);
        page.ResetColour();

        double y = DrawRow(page, left, top, columns, header, size, bold: true);
        foreach (var row in rows)
        {
            y = DrawRow(page, left, y, columns, row, size, bold: false);
        }

        page.Rectangle(left, y, width, top - y, 0.75);
        double x = left;
        for (int column = 0; column < columns.Count - 1; column++)
        {
            x += columns[column];
            page.Line(x, top, x, y, 0.5);
        }

        return y;
    }

    private static double DrawRow(PageWriter page, double left, double top, IReadOnlyList<double> columns, IReadOnlyList<string> cells, double size, bool bold)
    {
        var font = bold ? page.Fonts.Bold : page.Fonts.Regular;
        double height = RowHeight(page, columns, cells, size, bold);
        double x = left;
        for (int column = 0; column < columns.Count; column++)
        {
            var lines = page.Wrap(cells[column], columns[column] - 2 * Padding, size, font);
            page.Lines(lines, x + Padding, top - Padding - size, size, font, size * 1.2);
            x += columns[column];
        }

        double bottom = top - height;
        page.Line(left, bottom, left + columns.Sum(), bottom, 0.5);
        return bottom;
    }

    private static double RowHeight(PageWriter page, IReadOnlyList<double> columns, IReadOnlyList<string> cells, double size, bool bold)
    {
        var font = bold ? page.Fonts.Bold : page.Fonts.Regular;
        int lines = 1;
        for (int column = 0; column < columns.Count; column++)
        {
            lines = Math.Max(lines, page.Wrap(cells[column], columns[column] - 2 * Padding, size, font).Count);
        }

        return lines * size * 1.2 + 2 * Padding;
    }
}
