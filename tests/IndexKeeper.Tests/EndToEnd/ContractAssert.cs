using System.Text.Json;

namespace IndexKeeper.Tests.EndToEnd;

/// <summary>Checks fields of a <c>--json</c> answer against the contract of docs/cli.md, naming the step and every mismatch at once.</summary>
internal static class ContractAssert
{
    public static void Counts(JsonElement answer, string step, params (string Field, long Value)[] expected)
    {
        var wrong = new List<string>();
        foreach (var (field, value) in expected)
        {
            if (!answer.TryGetProperty(field, out var actual))
            {
                wrong.Add($"{field} is missing");
            }
            else if (actual.GetInt64() != value)
            {
                wrong.Add($"{field} = {actual.GetInt64()}, expected {value}");
            }
        }

        Assert.True(wrong.Count == 0, $"{step}: {string.Join("; ", wrong)}\n{answer}");
    }

    public static long Long(JsonElement answer, string field) => answer.GetProperty(field).GetInt64();
}
