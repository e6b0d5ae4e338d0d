namespace GridDrift.Outputs;

/// <summary>Small text files (checkpoints, manifests, batch scripts) written beside their final name and renamed, so no reader ever sees half of one.</summary>
internal static class AtomicFile
{
    public static void WriteAllText(string path, string text)
    {
        string temp = path + ".part";
        File.WriteAllText(temp, text);
        File.Move(temp, path, overwrite: true);
    }
}
