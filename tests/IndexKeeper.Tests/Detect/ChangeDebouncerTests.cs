using IndexKeeper.Core.Detect;

namespace IndexKeeper.Tests.Detect;

/// <summary>Per-file debouncing and its bound, with given times (no clock).</summary>
public sealed class ChangeDebouncerTests
{
    private static readonly DateTime T0 = new(2026, 3, 29, 0, 59, 58, DateTimeKind.Utc);
    private static readonly TimeSpan Settle = TimeSpan.FromSeconds(2);

    [Fact]
    public void APathIsHandedOutOnceItHasBeenQuietForTheSettleTime()
    {
        var debouncer = new ChangeDebouncer(Settle, 100);
        var path = new ChangedPath("scans", "2026/permit-114.pdf");
        debouncer.Note(path, T0);
        debouncer.Note(path, T0.AddSeconds(1.5));
        Assert.Empty(debouncer.TakeSettled(T0.AddSeconds(3)));
        Assert.Equal(T0.AddSeconds(3.5), debouncer.NextSettle());
        Assert.Equal([path], debouncer.TakeSettled(T0.AddSeconds(3.5)));
        Assert.Empty(debouncer.TakeSettled(T0.AddSeconds(10)));
        Assert.Null(debouncer.NextSettle());
    }

    [Fact]
    public void PathsSettleEachOnItsOwnTime()
    {
        var debouncer = new ChangeDebouncer(Settle, 100);
        var early = new ChangedPath("scans", "a.pdf");
        var late = new ChangedPath("scans", "b.pdf");
        debouncer.Note(early, T0);
        debouncer.Note(late, T0.AddSeconds(1));
        Assert.Equal([early], debouncer.TakeSettled(T0.AddSeconds(2)));
        Assert.Equal([late], debouncer.TakeSettled(T0.AddSeconds(3)));
    }

    [Fact]
    public void PastTheBoundTheRootGoesToAFullWalkAndItsPendingPathsAreDropped()
    {
        var debouncer = new ChangeDebouncer(Settle, 3);
        for (var i = 0; i < 3; i++)
        {
            Assert.True(debouncer.Note(new ChangedPath("scans", $"f{i}.pdf"), T0));
        }

        Assert.True(debouncer.Note(new ChangedPath("scans", "f0.pdf"), T0), "a path already pending does not grow the set");
        Assert.False(debouncer.Note(new ChangedPath("scans", "f3.pdf"), T0));
        Assert.Equal(0, debouncer.Pending);
        Assert.True(debouncer.Note(new ChangedPath("scans", "f4.pdf"), T0), "while a walk is due, the root's paths are left to it");
        Assert.Equal(0, debouncer.Pending);
        Assert.Equal(["scans"], debouncer.TakeWalks());
        Assert.Empty(debouncer.TakeWalks());
        Assert.True(debouncer.Note(new ChangedPath("scans", "f5.pdf"), T0));
        Assert.Equal(1, debouncer.Pending);
    }

    [Fact]
    public void AWalkRequestDropsOnlyThatRootsPaths()
    {
        var debouncer = new ChangeDebouncer(Settle, 10);
        debouncer.Note(new ChangedPath("scans", "a.pdf"), T0);
        debouncer.Note(new ChangedPath("drawings", "b.pdf"), T0);
        debouncer.RequestWalk("scans");
        Assert.Equal([new ChangedPath("drawings", "b.pdf")], debouncer.TakeSettled(T0.AddSeconds(5)));
    }
}
