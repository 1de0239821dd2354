namespace IndexKeeper.Tests.Isolation;

/// <summary>
/// A guard, not a timing check: fails the test instead of hanging the run when a read never returns.
/// The bound is far above any watchdog the tests set.
/// </summary>
internal static class NoHang
{
    private static readonly TimeSpan Bound = TimeSpan.FromMinutes(2);

    public static T Run<T>(Func<T> action)
    {
        var task = Task.Factory.StartNew(action, CancellationToken.None, TaskCreationOptions.LongRunning, TaskScheduler.Default);
        Assert.True(task.Wait(Bound), $"the call did not return within {Bound}");
        return task.Result;
    }

    public static void Run(Action action) => Run(() =>
    {
        action();
        return true;
    });

    /// <summary>The exception the call ended in, or a failure when it returned normally.</summary>
    public static TException Throws<TException>(Action action)
        where TException : Exception
    {
        var thrown = Run(() =>
        {
            try
            {
                action();
                return null;
            }
            catch (Exception e)
            {
                return e;
            }
        });
        return Assert.IsAssignableFrom<TException>(thrown);
    }
}
