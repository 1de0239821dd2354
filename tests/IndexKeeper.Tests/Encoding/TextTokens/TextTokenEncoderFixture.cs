using IndexKeeper.Core.Encoding.TextTokens;

namespace IndexKeeper.Tests.Encoding.TextTokens;

/// <summary>Loads the model once per test class: it is ~90 MB and takes a second or two to prepare.</summary>
public sealed class TextTokenEncoderFixture : IDisposable
{
    public TextTokenEncoderFixture()
    {
        Model = ModelResources.ReadModel();
        Vocabulary = ModelResources.ReadVocabulary();
        Encoder = TextTokenEncoderFactory.Create(new TextTokenEncoderOptions(), Model, Vocabulary);
    }

    internal byte[] Model { get; }

    internal byte[] Vocabulary { get; }

    internal TextTokenEncoder Encoder { get; }

    /// <summary>The vocabulary file's lines; a token's id is its 0-based line number.</summary>
    public IReadOnlyList<string> VocabularyLines() =>
        System.Text.Encoding.UTF8.GetString(Vocabulary).Split('\n').Select(line => line.TrimEnd('\r')).ToArray();

    public void Dispose() => Encoder.Dispose();
}
