using System.Diagnostics;
using IndexKeeper.Tests.Support;

namespace IndexKeeper.Tests.CommandLine;

/// <summary>Shell completion: the shipped bash script (config/indexkeeper-completion.bash) asks the real executable.</summary>
public sealed class CompletionTests
{
    [Theory]
    [InlineData("indexkeeper sy", "sync")]
    [InlineData("indexkeeper sync --enc", "--encoder")]
    [InlineData("indexkeeper sync --encoder ha", "hashed-terms")]
    [InlineData("indexkeeper encoders --check", "--check-canaries")]
    public void The_bash_completion_script_offers_commands_options_and_encoder_names(string line, string offered)
    {
        if (!OperatingSystem.IsLinux())
        {
            return;
        }

        using var temp = new TempDirectory();

        // "indexkeeper" on PATH, as an installed tool would be.
        var shim = temp.Write("bin/indexkeeper", $"#!/bin/sh\nexec dotnet '{Path.Combine(AppContext.BaseDirectory, "indexkeeper.dll")}' \"$@\"\n");
        File.SetUnixFileMode(shim, UnixFileMode.UserRead | UnixFileMode.UserWrite | UnixFileMode.UserExecute);
        var script = Path.Combine(RepositoryRoot.Path, "config", "indexkeeper-completion.bash");

        // What bash sets before it calls a completion function (bash(1), "Programmable Completion").
        var start = new ProcessStartInfo("bash") { RedirectStandardOutput = true, RedirectStandardError = true, UseShellExecute = false };
        start.ArgumentList.Add("-c");
        start.ArgumentList.Add(
            $"source '{script}'; COMP_LINE=\"$1\"; COMP_POINT=${{#1}}; read -r -a COMP_WORDS <<< \"$1\"; " +
            "[[ \"$1\" == *' ' ]] && COMP_WORDS+=(''); COMP_CWORD=$(( ${#COMP_WORDS[@]} - 1 )); _indexkeeper_complete; printf '%s\\n' \"${COMPREPLY[@]}\"");
        start.ArgumentList.Add("bash");
        start.ArgumentList.Add(line);
        start.Environment["PATH"] = Path.GetDirectoryName(shim) + ":" + Environment.GetEnvironmentVariable("PATH");
        using var process = Process.Start(start)!;
        var output = process.StandardOutput.ReadToEnd();
        process.WaitForExit();

        Assert.Contains(offered, output.Split('\n'));
    }
}
