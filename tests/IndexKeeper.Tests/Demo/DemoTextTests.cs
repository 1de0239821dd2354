using IndexKeeper.Demo;

namespace IndexKeeper.Tests.Demo;

public sealed class DemoTextTests
{
    [Fact]
    public void Same_seed_same_words_in_printable_ascii_with_every_slot_filled()
    {
        foreach (var topic in Enum.GetValues<DemoTopic>())
        {
            Check(topic);
        }
    }

    private static void Check(DemoTopic topic)
    {
        string first = Sample(new DemoText(new DemoRandom(9), topic, "Highfold"));
        string second = Sample(new DemoText(new DemoRandom(9), topic, "Highfold"));
        Assert.Equal(first, second);
        Assert.NotEqual(first, Sample(new DemoText(new DemoRandom(10), topic, "Highfold")));
        // The standard 14 fonts are written with a one-byte encoding: printable ASCII (without the two
        // quote characters, which that encoding places elsewhere) is what every face has.
        Assert.All(first, character => Assert.True(character is >= ' ' and <= '~' and not '\'' and not '`', $"U+{(int)character:X4}"));
        Assert.DoesNotContain("{", first, StringComparison.Ordinal);
    }

    [Fact]
    public void Fixed_point_numbers_are_written_without_culture_or_floating_point()
    {
        Assert.Equal("1.83", DemoNumber.Fixed(183, 2));
        Assert.Equal("0.05", DemoNumber.Fixed(5, 2));
        Assert.Equal("-2.5", DemoNumber.Fixed(-25, 1));
        Assert.Equal("112.40", DemoNumber.Fixed(11240, 2));
        Assert.Equal("7", DemoNumber.Fixed(7, 0));
    }

    private static string Sample(DemoText text) =>
        string.Join(" | ", [text.Paragraph(6), .. text.ProcedureSteps(8), text.Amendment(), text.Reading()]);
}
