namespace IndexKeeper.Demo;

/// <summary>An RGB colour for painted rasters; grey rasters use its luma (ITU-R BT.601 weights, integer form).</summary>
internal readonly record struct DemoColour(byte Red, byte Green, byte Blue)
{
    public byte Grey => (byte)((Red * 299 + Green * 587 + Blue * 114 + 500) / 1000);

    public static DemoColour OfGrey(int level)
    {
        byte value = (byte)Math.Clamp(level, 0, 255);
        return new DemoColour(value, value, value);
    }

    /// <summary>The colour <paramref name="numerator"/>/<paramref name="denominator"/> of the way from one to the other.</summary>
    public static DemoColour Mix(DemoColour from, DemoColour to, int numerator, int denominator) => new(
        (byte)(from.Red + (to.Red - from.Red) * numerator / denominator),
        (byte)(from.Green + (to.Green - from.Green) * numerator / denominator),
        (byte)(from.Blue + (to.Blue - from.Blue) * numerator / denominator));

    public DemoColour Shade(int delta) => new(
        (byte)Math.Clamp(Red + delta, 0, 255),
        (byte)Math.Clamp(Green + delta, 0, 255),
        (byte)Math.Clamp(Blue + delta, 0, 255));
}
