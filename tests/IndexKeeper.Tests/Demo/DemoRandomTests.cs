using IndexKeeper.Demo;

namespace IndexKeeper.Tests.Demo;

public sealed class DemoRandomTests
{
    [Fact]
    public void Matches_the_splitmix64_reference_sequence()
    {
        // Rosetta Code, "Pseudo-random numbers/Splitmix64": the first five outputs for seed 1234567,
        // as the reference splitmix64.c gives them.
        var random = new DemoRandom(1234567);
        ulong[] expected = [6457827717110365317, 3203168211198807973, 9817491932198370423, 4593380528125082431, 16408922859458223821];
        Assert.Equal(expected, expected.Select(_ => random.NextUInt64()));
    }

    [Fact]
    public void Bounded_draws_stay_in_range_and_reach_both_ends()
    {
        var random = new DemoRandom(42);
        var seen = Enumerable.Range(0, 2000).Select(_ => random.Next(-3, 4)).ToHashSet();
        Assert.Equal(Enumerable.Range(-3, 7), seen.Order());
        Assert.Throws<ArgumentOutOfRangeException>(() => random.Next(0));
    }

    [Fact]
    public void Streams_for_purposes_are_stable_and_distinct()
    {
        Assert.Equal(DemoRandom.For(2026, "manual/HWA-OM-101").NextUInt64(), DemoRandom.For(2026, "manual/HWA-OM-101").NextUInt64());
        Assert.NotEqual(DemoRandom.For(2026, "manual/HWA-OM-101").NextUInt64(), DemoRandom.For(2026, "manual/HWA-OM-102").NextUInt64());
        Assert.NotEqual(DemoRandom.For(2026, "manual/HWA-OM-101").NextUInt64(), DemoRandom.For(2027, "manual/HWA-OM-101").NextUInt64());
    }
}
