namespace IndexKeeper.Demo;

/// <summary>Line charts drawn from lines: axes, a value grid with labels, one polyline per series, a legend.</summary>
internal static class ChartDrawer
{
    private const int GridSteps = 5;

    public static void Draw(PageWriter page, double left, double bottom, double width, double height, string title, string unit, int decimals, IReadOnlyList<ChartSeries> series)
    {
        page.Text(title + " (" + unit + ")", left, bottom + height + 8, 10, page.Fonts.Bold);

        int low = series.Min(line => line.Values.Min());
        int high = series.Max(line => line.Values.Max());
        (int axisLow, int axisStep) = NiceAxis(low, high);
        double plotLeft = left + 38;
        double plotBottom = bottom + 28;
        double plotWidth = width - 38;
        double plotHeight = height - 28;

        page.StrokeColour(205, 205, 205);
        for (int step = 0; step <= GridSteps; step++)
        {
            double y = plotBottom + plotHeight * step / GridSteps;
            page.Line(plotLeft, y, plotLeft + plotWidth, y, 0.3);
        }

        page.ResetColour();
        for (int step = 0; step <= GridSteps; step++)
        {
            double y = plotBottom + plotHeight * step / GridSteps;
            page.TextRight(DemoNumber.Fixed(axisLow + step * axisStep, decimals), plotLeft - 4, y - 2.5, 7);
        }

        page.Line(plotLeft, plotBottom, plotLeft, plotBottom + plotHeight, 0.9);
        page.Line(plotLeft, plotBottom, plotLeft + plotWidth, plotBottom, 0.9);

        int points = series[0].Values.Count;
        for (int point = 0; point < points; point += 5)
        {
            double x = plotLeft + plotWidth * point / (points - 1);
            page.Line(x, plotBottom, x, plotBottom - 3, 0.5);
            page.TextCentred(DemoNumber.Integer(point + 1), x, plotBottom - 12, 7);
        }

        double span = axisStep * GridSteps;
        double legendX = plotLeft;
        foreach (var line in series)
        {
            page.StrokeColour(line.Red, line.Green, line.Blue);
            for (int point = 1; point < points; point++)
            {
                page.Line(
                    plotLeft + plotWidth * (point - 1) / (points - 1),
                    plotBottom + plotHeight * (line.Values[point - 1] - axisLow) / span,
                    plotLeft + plotWidth * point / (points - 1),
                    plotBottom + plotHeight * (line.Values[point] - axisLow) / span,
                    1.1);
            }

            page.Line(legendX, bottom + 4, legendX + 16, bottom + 4, 2);
            page.ResetColour();
            page.Text(line.Name, legendX + 20, bottom + 1.5, 7);
            legendX += 28 + page.TextWidth(line.Name, page.Fonts.Regular, 7);
        }
    }

    /// <summary>Lowest grid value and grid step (both scaled) so that GridSteps steps cover [low, high].</summary>
    private static (int Low, int Step) NiceAxis(int low, int high)
    {
        int[] steps = [1, 2, 5, 10, 20, 25, 50, 100, 200, 250, 500, 1000, 2000, 2500, 5000, 10000];
        foreach (int step in steps)
        {
            int axisLow = FloorTo(low, step);
            if (axisLow + step * GridSteps >= high)
            {
                return (axisLow, step);
            }
        }

        throw new ArgumentOutOfRangeException(nameof(high), high, "chart range too wide");
    }

    private static int FloorTo(int value, int step) => value >= 0 ? value / step * step : -((-value + step - 1) / step * step);
}
