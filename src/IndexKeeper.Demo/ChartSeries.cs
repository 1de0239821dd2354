namespace IndexKeeper.Demo;

/// <summary>One line of a chart: values as integers scaled by 10^decimals of the chart, and the line's colour.</summary>
internal sealed record ChartSeries(string Name, IReadOnlyList<int> Values, byte Red, byte Green, byte Blue);
