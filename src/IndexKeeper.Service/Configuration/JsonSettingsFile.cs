using System.Text;
using System.Text.Json;

namespace IndexKeeper.Service.Configuration;

/// <summary>
/// Reads a settings file as the JSON configuration provider will (comments and trailing commas allowed) and
/// names each thing that would stop it, as <c>FILE:LINE:COLUMN: what</c> (1-based; columns count characters):
/// the first syntax error (JSON cannot be read on past it), and every key given twice in one object (keys
/// are compared ignoring case, as configuration keys are).
/// </summary>
internal static class JsonSettingsFile
{
    public static IReadOnlyList<string> Problems(string path)
    {
        var bytes = File.ReadAllBytes(path);

        // A UTF-8 byte order mark is skipped by the provider; it sits before line 1, column 1.
        if (bytes.AsSpan().StartsWith("\uFEFF"u8))
        {
            bytes = bytes[3..];
        }

        var problems = new List<string>();
        var reader = new Utf8JsonReader(bytes, new JsonReaderOptions { CommentHandling = JsonCommentHandling.Skip, AllowTrailingCommas = true });
        var objects = new Stack<HashSet<string>?>();
        try
        {
            while (reader.Read())
            {
                switch (reader.TokenType)
                {
                    case JsonTokenType.StartObject:
                        objects.Push(new HashSet<string>(StringComparer.OrdinalIgnoreCase));
                        break;
                    case JsonTokenType.StartArray:
                        objects.Push(null);
                        break;
                    case JsonTokenType.EndObject or JsonTokenType.EndArray:
                        objects.Pop();
                        break;
                    case JsonTokenType.PropertyName when objects.Peek() is { } keys && !keys.Add(reader.GetString()!):
                        var (line, column) = Position(bytes, (int)reader.TokenStartIndex);
                        problems.Add($"{path}:{line}:{column}: the key \"{reader.GetString()}\" is given twice in one object; keep one.");
                        break;
                }
            }
        }
        catch (JsonException ex) when (ex.LineNumber is { } line && ex.BytePositionInLine is { } inLine)
        {
            // The reader's own message ends in its 0-based position; ours is the editor's, 1-based.
            var message = ex.Message.Split(" LineNumber:", 2)[0].TrimEnd();
            problems.Add($"{path}:{line + 1}:{Column(bytes, (int)line, (int)inLine)}: {message}");
        }

        return problems;
    }

    private static (int Line, int Column) Position(byte[] bytes, int offset)
    {
        var lineStart = Array.LastIndexOf(bytes, (byte)'\n', Math.Max(0, offset - 1)) + 1;
        var line = 1 + bytes.AsSpan(0, lineStart).Count((byte)'\n');
        return (line, Encoding.UTF8.GetCharCount(bytes, lineStart, offset - lineStart) + 1);
    }

    private static int Column(byte[] bytes, int zeroBasedLine, int bytesInLine)
    {
        var lineStart = 0;
        for (var i = 0; i < zeroBasedLine; i++)
        {
            lineStart = Array.IndexOf(bytes, (byte)'\n', lineStart) + 1;
        }

        var length = Math.Min(bytesInLine, bytes.Length - lineStart);
        return Encoding.UTF8.GetCharCount(bytes, lineStart, Math.Max(0, length)) + 1;
    }
}
