using System.Runtime.InteropServices;

namespace IndexKeeper.Tests.Detect;

/// <summary>
/// Runs an action with permission checks in force even when the tests run as root. Root bypasses file
/// permissions (CAP_DAC_OVERRIDE), so chmod 000 proves nothing; setfsuid changes the file-system user of
/// the calling thread only, and the kernel drops the file capabilities from that thread while the
/// file-system user is not 0 (capabilities(7)). The action runs on a dedicated thread, restored after.
/// </summary>
internal static partial class Unprivileged
{
    private const uint Nobody = 65534;

    public static T Run<T>(Func<T> action)
    {
        if (geteuid() != 0)
        {
            return action();
        }

        T result = default!;
        Exception? failure = null;
        var thread = new Thread(() =>
        {
            setfsuid(Nobody);
            try
            {
                if (setfsuid(uint.MaxValue) != Nobody)
                {
                    throw new InvalidOperationException("setfsuid did not take effect");
                }

                result = action();
            }
            catch (Exception e)
            {
                failure = e;
            }
            finally
            {
                setfsuid(0);
            }
        });
        thread.Start();
        thread.Join();
        return failure is null ? result : throw new InvalidOperationException("unprivileged action failed", failure);
    }

    // setfsuid(-1) changes nothing and returns the current file-system user (setfsuid(2)).
    [DllImport("libc", SetLastError = true)]
    private static extern uint setfsuid(uint fsuid);

    [DllImport("libc")]
    private static extern uint geteuid();
}
