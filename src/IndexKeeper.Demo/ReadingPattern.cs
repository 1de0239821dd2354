namespace IndexKeeper.Demo;

/// <summary>A plausible instrument reading: "#" in <see cref="Template"/> is replaced by a value drawn
/// from [Min, Max] (scaled by 10^Decimals).</summary>
internal sealed record ReadingPattern(string Template, int Min, int Max, int Decimals)
{
    public string Draw(DemoRandom random) =>
        Template.Replace("#", DemoNumber.Fixed(random.Next(Min, Max + 1), Decimals), StringComparison.Ordinal);
}
