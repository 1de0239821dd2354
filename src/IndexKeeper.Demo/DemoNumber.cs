using System.Globalization;

namespace IndexKeeper.Demo;

/// <summary>Formats numbers for demo text from integers only: no floating point, no culture, so the
/// same digits come out on every platform.</summary>
internal static class DemoNumber
{
    public static string Integer(int value) => value.ToString(CultureInfo.InvariantCulture);

    /// <summary><paramref name="scaled"/> / 10^<paramref name="decimals"/>, e.g. (183, 2) gives "1.83".</summary>
    public static string Fixed(int scaled, int decimals)
    {
        if (decimals == 0)
        {
            return Integer(scaled);
        }

        int divisor = 1;
        for (int i = 0; i < decimals; i++)
        {
            divisor *= 10;
        }

        string sign = scaled < 0 ? "-" : "";
        int magnitude = Math.Abs(scaled);
        return sign + Integer(magnitude / divisor) + "." + Integer(magnitude % divisor).PadLeft(decimals, '0');
    }

    /// <summary>A date as ISO 8601 (yyyy-mm-dd).</summary>
    public static string Date(DateOnly date) => date.ToString("yyyy-MM-dd", CultureInfo.InvariantCulture);
}
