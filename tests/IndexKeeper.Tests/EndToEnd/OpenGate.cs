using System.Buffers.Binary;
using System.Runtime.InteropServices;

namespace IndexKeeper.Tests.EndToEnd;

/// <summary>
/// Holds one file's open by a second process until an action has run, through fanotify permission events
/// (fanotify(7), FAN_OPEN_PERM: the opener blocks until the listener answers). The scan process opens a
/// file to hash it; the reader worker, a second process, opens it to read: running the action there makes
/// "the file changed while it was being read" happen at the same instant every time, with no timing.
/// Needs Linux and CAP_SYS_ADMIN; <see cref="Available"/> says whether this machine grants them.
/// </summary>
internal sealed class OpenGate : IDisposable
{
    // Constants of <linux/fanotify.h> and <fcntl.h>.
    private const uint ClassContent = 0x04;
    private const uint CloseOnExec = 0x01;
    private const uint NonBlocking = 0x02;
    private const uint MarkAdd = 0x01;
    private const ulong OpenPermission = 0x0001_0000;
    private const uint Allow = 0x01;
    private const int AtCurrentDirectory = -100;
    private const int MetadataVersion = 3;
    private const int MetadataLength = 24;

    private readonly int group;
    private readonly Action action;
    private readonly Thread listener;
    private volatile bool stopping;
    private int firstOpener;

    public OpenGate(string path, Action beforeSecondOpener)
    {
        action = beforeSecondOpener;
        group = fanotify_init(ClassContent | CloseOnExec | NonBlocking, 0);
        if (group < 0 || fanotify_mark(group, MarkAdd, OpenPermission, AtCurrentDirectory, [.. System.Text.Encoding.UTF8.GetBytes(path), 0]) != 0)
        {
            var error = Marshal.GetLastPInvokeError();
            Dispose();
            throw new InvalidOperationException($"fanotify on {path} failed: errno {error}");
        }

        listener = new Thread(Listen) { IsBackground = true, Name = "open gate" };
        listener.Start();
    }

    public static bool Available { get; } = Probe();

    /// <summary>Opens seen so far, by any process.</summary>
    public int Opens { get; private set; }

    /// <summary>True once the action has run, before a second process's open went on.</summary>
    public bool Fired { get; private set; }

    public Exception? Failure { get; private set; }

    public void Dispose()
    {
        stopping = true;
        listener?.Join();

        // Closing the group lets any open still waiting go on (fanotify(7)).
        if (group >= 0)
        {
            close(group);
        }
    }

    private static bool Probe()
    {
        if (!OperatingSystem.IsLinux())
        {
            return false;
        }

        // A mark on a file in the temp folder, where the tests' stores live (some file systems refuse marks).
        var probe = fanotify_init(ClassContent | CloseOnExec, 0);
        if (probe < 0)
        {
            return false;
        }

        var file = Path.GetTempFileName();
        try
        {
            return fanotify_mark(probe, MarkAdd, OpenPermission, AtCurrentDirectory, [.. System.Text.Encoding.UTF8.GetBytes(file), 0]) == 0;
        }
        finally
        {
            close(probe);
            File.Delete(file);
        }
    }

    private void Listen()
    {
        var buffer = new byte[4096];
        while (!stopping)
        {
            var read = (int)read_events(group, buffer, buffer.Length);
            if (read <= 0)
            {
                Thread.Sleep(5);
                continue;
            }

            for (var at = 0; at + MetadataLength <= read;)
            {
                var span = buffer.AsSpan(at);
                var length = (int)BinaryPrimitives.ReadUInt32LittleEndian(span);
                var file = BinaryPrimitives.ReadInt32LittleEndian(span[16..]);
                var pid = BinaryPrimitives.ReadInt32LittleEndian(span[20..]);
                if (span[4] == MetadataVersion)
                {
                    Decide(pid);
                }

                Respond(file);
                close(file);
                at += Math.Max(length, MetadataLength);
            }
        }
    }

    private void Decide(int pid)
    {
        Opens++;
        if (firstOpener == 0)
        {
            firstOpener = pid;
        }
        else if (pid != firstOpener && !Fired)
        {
            Fired = true;
            try
            {
                action();
            }
            catch (Exception e) when (e is IOException or UnauthorizedAccessException)
            {
                Failure = e;
            }
        }
    }

    private void Respond(int file)
    {
        var response = new byte[8];
        BinaryPrimitives.WriteInt32LittleEndian(response, file);
        BinaryPrimitives.WriteUInt32LittleEndian(response.AsSpan(4), Allow);
        write_response(group, response, response.Length);
    }

    [DllImport("libc", SetLastError = true)]
    private static extern int fanotify_init(uint flags, uint eventFileFlags);

    [DllImport("libc", SetLastError = true)]
    private static extern int fanotify_mark(int group, uint flags, ulong mask, int directory, byte[] path);

    [DllImport("libc", EntryPoint = "read", SetLastError = true)]
    private static extern nint read_events(int fd, byte[] buffer, nint count);

    [DllImport("libc", EntryPoint = "write", SetLastError = true)]
    private static extern nint write_response(int fd, byte[] buffer, nint count);

    [DllImport("libc")]
    private static extern int close(int fd);
}
