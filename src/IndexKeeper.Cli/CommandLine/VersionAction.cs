using System.CommandLine;
using System.CommandLine.Invocation;
using System.Reflection;
using IndexKeeper.Core.Encoding;
using IndexKeeper.Core.Encoding.PageImages;
using IndexKeeper.Service.Configuration;
using IndexKeeper.Service.Hosting;

namespace IndexKeeper.Cli.CommandLine;

/// <summary>
/// <c>--version</c>: the tool's version and the encoder id of each built-in encoder at its default settings,
/// so an operator can tell which vectors a build makes before pointing it at an index (docs/encoders.md).
/// </summary>
internal sealed class VersionAction : SynchronousCommandLineAction
{
    public override int Invoke(ParseResult parseResult)
    {
        ArgumentNullException.ThrowIfNull(parseResult);
        var output = parseResult.InvocationConfiguration.Output;
        var version = typeof(VersionAction).Assembly.GetCustomAttribute<AssemblyInformationalVersionAttribute>()?.InformationalVersion ?? "unknown";
        output.WriteLine($"indexkeeper {version} (.NET {Environment.Version})");
        output.WriteLine("built-in encoders at their default settings (encoder id):");
        foreach (var name in IndexKeeperOptionsValidator.EncoderNames)
        {
            if (name == PageImageEncoderFactory.Name)
            {
                // Its id hashes the model files of the operator's own export: there is no default one.
                output.WriteLine($"  {name,-13} id depends on the configured model (Encoder:PageImage)");
                continue;
            }

            var encoder = EncoderFactory.Create(new EncoderOptions { Name = name, IntraOpThreads = 1 });
            try
            {
                output.WriteLine($"  {name,-13} {encoder.Identity.Id}  d={encoder.Identity.Dimensions}");
            }
            finally
            {
                (encoder as IDisposable)?.Dispose();
            }
        }

        return 0;
    }
}
