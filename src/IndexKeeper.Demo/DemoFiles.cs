namespace IndexKeeper.Demo;

/// <summary>File operations on store paths ("root/relative", '/'-separated) under the demo directory.</summary>
internal static class DemoFiles
{
    public static string FullPath(string directory, string storePath) =>
        Path.Combine([directory, .. storePath.Split('/')]);

    public static void Write(string directory, string storePath, byte[] bytes)
    {
        string path = FullPath(directory, storePath);
        Directory.CreateDirectory(Path.GetDirectoryName(path)!);
        File.WriteAllBytes(path, bytes);
    }

    /// <summary>Saves as many desktop programs do: a new file beside the old one, renamed over it.</summary>
    public static void Replace(string directory, string storePath, byte[] bytes)
    {
        string path = FullPath(directory, storePath);
        string temporary = Path.Combine(Path.GetDirectoryName(path)!, "~" + Path.GetFileName(path) + ".tmp");
        File.WriteAllBytes(temporary, bytes);
        File.Move(temporary, path, overwrite: true);
    }

    /// <summary>Moves a file to another store path, or copies it there when the source is kept; makes the
    /// target's folder if needed and never writes over a file.</summary>
    public static void Relocate(string directory, string fromStorePath, string toStorePath, bool keepSource)
    {
        string source = FullPath(directory, fromStorePath);
        string target = FullPath(directory, toStorePath);
        Directory.CreateDirectory(Path.GetDirectoryName(target)!);
        if (keepSource)
        {
            File.Copy(source, target);
        }
        else
        {
            File.Move(source, target);
        }
    }
}
