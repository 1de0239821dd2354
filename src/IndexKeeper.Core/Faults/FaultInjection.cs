using System.Globalization;
using System.Runtime.InteropServices;

namespace IndexKeeper.Core.Faults;

/// <summary>
/// A test facility: stops or fails the process at the Nth reach of one named I/O point
/// (<see cref="FaultPoints"/>), so crash tests are deterministic instead of killing at an instant.
/// Armed only by the environment variable <see cref="Variable"/>, read once when this type is first
/// used; it is not a setting (no configuration file or <c>INDEXKEEPER_</c> variable reaches it) and,
/// unset, every <see cref="Reach"/> costs one null check. Format: <c>point:action[:nth]</c>, nth ≥ 1
/// (default 1); actions: <c>exit</c> (ends the process at once with <see cref="ExitCode"/>, like a kill:
/// no finally blocks, no flush of buffered writes), <c>enospc</c> and <c>eio</c> (throw the
/// <see cref="IOException"/> a full or failing disk throws), <c>pause</c> (waits at the point until the
/// file named by <see cref="ResumeVariable"/> exists, or until <see cref="Resume"/>, which a command calls
/// once a stop signal has cancelled its work: a test runs other processes meanwhile, or knows where the
/// process stands when it sends a signal, with no timing). See docs/fault-matrix.md.
/// </summary>
internal static partial class FaultInjection
{
    public const string Variable = "IK_FAULT_INJECTION";

    /// <summary>The file whose appearance ends a <c>pause</c>.</summary>
    public const string ResumeVariable = "IK_FAULT_RESUME";

    /// <summary>How long <c>pause</c> waits before it fails the process (a test that never resumes it).</summary>
    private static readonly TimeSpan PauseLimit = TimeSpan.FromMinutes(10);

    private static readonly ManualResetEventSlim Resumed = new();

    /// <summary>The exit code of the <c>exit</c> action; no command exits with it otherwise.</summary>
    public const int ExitCode = 86;

    /// <summary>The first words of the line written to stderr when a fault fires.</summary>
    public const string FiredMarker = "indexkeeper: injected fault ";

    // errno values of Linux (asm-generic/errno-base.h), which .NET puts in IOException.HResult on Unix;
    // on Windows, HRESULT_FROM_WIN32 of ERROR_DISK_FULL (112) and ERROR_IO_DEVICE (1117).
    private const int UnixNoSpace = 28;
    private const int UnixIoError = 5;
    private const int WindowsDiskFull = unchecked((int)0x80070070);
    private const int WindowsIoDevice = unchecked((int)0x8007045D);

    private static readonly Armed? Fault;

    static FaultInjection()
    {
        Fault = Parse(Environment.GetEnvironmentVariable(Variable), out var problem);
        Problem = problem;
    }

    /// <summary>Null when the variable is unset or well formed; else what is wrong with it (the command checks at start).</summary>
    public static string? Problem { get; }

    /// <summary>Marks one reach of <paramref name="point"/>; fires the armed fault at its Nth reach.</summary>
    public static void Reach(string point)
    {
        if (Fault is not null)
        {
            Fault.Reached(point);
        }
    }

    /// <summary>Lets a process held by the <c>pause</c> action go on; without one armed it changes nothing.</summary>
    public static void Resume() => Resumed.Set();

    private static Armed? Parse(string? value, out string? problem)
    {
        problem = null;
        if (string.IsNullOrEmpty(value))
        {
            return null;
        }

        var parts = value.Split(':');
        var nth = 1;
        var resume = Environment.GetEnvironmentVariable(ResumeVariable);
        if (parts.Length is < 2 or > 3
            || !(FaultPoints.All.Contains(parts[0]) || FaultPoints.WorkQueue.Contains(parts[0]))
            || parts[1] is not ("exit" or "enospc" or "eio" or "pause")
            || (parts.Length == 3 && (!int.TryParse(parts[2], NumberStyles.None, CultureInfo.InvariantCulture, out nth) || nth < 1)))
        {
            problem = $"{Variable}='{value}': expected point:action[:nth] with a point of docs/fault-matrix.md, action exit, enospc, eio or pause (resumed by the file {ResumeVariable} names, or by a stop signal), nth ≥ 1.";
            return null;
        }

        return new Armed(parts[0], parts[1], nth, resume);
    }

    [LibraryImport("libc", EntryPoint = "_exit")]
    private static partial void ExitNow(int status);

    [LibraryImport("kernel32.dll", EntryPoint = "TerminateProcess")]
    [return: MarshalAs(UnmanagedType.Bool)]
    private static partial bool TerminateProcess(IntPtr process, uint exitCode);

    [LibraryImport("kernel32.dll", EntryPoint = "GetCurrentProcess")]
    private static partial IntPtr CurrentProcess();

    private sealed class Armed(string point, string action, int nth, string? resume)
    {
        private int reached;

        public void Reached(string name)
        {
            if (name != point || Interlocked.Increment(ref reached) != nth)
            {
                return;
            }

            Console.Error.WriteLine($"{FiredMarker}{action} at {point} (reach {nth})");
            Console.Error.Flush();
            switch (action)
            {
                case "exit":
                    // Like SIGKILL: what the page cache holds stays, what managed buffers hold is lost.
                    if (OperatingSystem.IsWindows())
                    {
                        TerminateProcess(CurrentProcess(), ExitCode);
                    }

                    ExitNow(ExitCode);
                    break;
                case "pause":
                    // Polls for a file a test creates once its own steps are done: the order is fixed by the test, not by a clock.
                    var waited = System.Diagnostics.Stopwatch.StartNew();
                    while (!Resumed.Wait(10) && !(resume is not null && File.Exists(resume)))
                    {
                        if (waited.Elapsed > PauseLimit)
                        {
                            throw new InvalidOperationException($"the fault pause at {point} was never resumed");
                        }
                    }

                    break;
                case "enospc":
                    throw new IOException($"No space left on device (fault injected at {point})", OperatingSystem.IsWindows() ? WindowsDiskFull : UnixNoSpace);
                default:
                    throw new IOException($"Input/output error (fault injected at {point})", OperatingSystem.IsWindows() ? WindowsIoDevice : UnixIoError);
            }
        }
    }
}
