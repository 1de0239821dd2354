using System.Text;
using IndexKeeper.Core.Documents.Isolation;

namespace IndexKeeper.Tests.Isolation;

/// <summary>
/// Shell scripts that play a reader worker gone wrong, for the supervisor tests. Each announces itself
/// with a correct hello (built by the production encoder), waits for the first byte of a request, then
/// misbehaves. With a counter file, only the first starts misbehave and later starts run the real worker.
/// </summary>
internal static class StandInWorker
{
    /// <summary>Killed by SIGKILL mid-read.</summary>
    public const string KilledMidRead = "kill -9 $$";

    /// <summary>Never answers.</summary>
    public const string Stalls = "exec sleep 600";

    /// <summary>Answers with text that is not a frame.</summary>
    public const string WritesGarbage = "printf 'this is not a frame of any kind'; exec sleep 600";

    public static ReaderWorkerCommand Command(string misbehaviour) =>
        new("/bin/sh", ["-c", $"{PrintBytes(Hello())}; head -c 1 >/dev/null; {misbehaviour}"]);

    /// <summary>Misbehaves on its first start only; every later start is the real worker.</summary>
    public static ReaderWorkerCommand OnceThenReal(string misbehaviour, string counterPath) => ThenReal(misbehaviour, counterPath, 1);

    /// <summary>Misbehaves on its first <paramref name="starts"/> starts; every later start is the real worker.</summary>
    public static ReaderWorkerCommand ThenReal(string misbehaviour, string counterPath, int starts)
    {
        var real = ReaderWorkerCommand.ForThisInstallation();
        var exec = string.Join(' ', new[] { real.FileName }.Concat(real.Arguments).Select(Quote));
        var counter = Quote(counterPath);
        return new("/bin/sh", ["-c", $"n=$(cat {counter} 2>/dev/null || echo 0); if [ \"$n\" -ge {starts} ]; then exec {exec}; fi; echo $((n + 1)) > {counter}; {PrintBytes(Hello())}; head -c 1 >/dev/null; {misbehaviour}"]);
    }

    /// <summary>A shell command that writes exactly these bytes to stdout.</summary>
    public static string PrintBytes(ReadOnlySpan<byte> bytes)
    {
        var format = new StringBuilder("printf '");
        foreach (var b in bytes)
        {
            format.Append('\\').Append(Convert.ToString(b, 8).PadLeft(3, '0'));
        }

        return format.Append('\'').ToString();
    }

    public static byte[] Hello() => FrameStream.Encode(MessageCodec.Hello());

    private static string Quote(string text) => "'" + text.Replace("'", "'\\''", StringComparison.Ordinal) + "'";
}
