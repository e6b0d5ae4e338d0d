namespace GridDrift.Pipeline;

/// <summary>
/// One run at a time per products folder: the run holds OUT/.griddrift-run/lock open without
/// sharing (an advisory file lock the operating system drops when the process ends, however it
/// ends), so a second run writing into the same folder is refused, and a run killed outright does
/// not leave the folder locked.
/// </summary>
internal sealed class RunLock : IDisposable
{
    readonly FileStream _stream;

    RunLock(FileStream stream) => _stream = stream;

    public static RunLock Take(string stateDir, string outDir)
    {
        string path = Path.Combine(stateDir, "lock");
        try
        {
            var stream = new FileStream(path, FileMode.OpenOrCreate, FileAccess.ReadWrite, FileShare.None);
            stream.SetLength(0);
            var text = System.Text.Encoding.UTF8.GetBytes($"{Environment.ProcessId} {DateTime.UtcNow:O}\n");
            stream.Write(text);
            stream.Flush();
            return new RunLock(stream);
        }
        catch (IOException)
        {
            string holder = "";
            try { holder = File.ReadAllText(path).Split(' ')[0]; } catch (IOException) { }
            throw new BadInputException(outDir, null, $"another griddrift run is writing into this folder (process {holder}); wait for it to end, or give the recipe another out folder");
        }
    }

    public void Dispose() => _stream.Dispose();
}
