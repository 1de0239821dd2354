namespace IndexKeeper.Cli;

internal static class Program
{
    private static int Main(string[] args)
    {
        Console.Error.WriteLine("indexkeeper: under construction");
        return args.Length == 0 ? 2 : 0;
    }
}
