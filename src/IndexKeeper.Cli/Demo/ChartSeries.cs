namespace IndexKeeper.Cli.Demo;

/// <summary>One line of a chart: values in tenths of the unit, and the colour of its line.</summary>
internal sealed record ChartSeries(string Name, IReadOnlyList<int> Tenths, byte Red, byte Green, byte Blue);
