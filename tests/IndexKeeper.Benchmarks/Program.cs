namespace IndexKeeper.Benchmarks;

internal static class Program
{
    private static int Main()
    {
        Console.WriteLine("no benchmarks yet");
        return 0;
    }
}
