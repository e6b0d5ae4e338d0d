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
        // who holds the lock is written beside it: the lock file itself cannot be read while it is held
        string holderPath = Path.Combine(stateDir, "lock.holder");
        FileStream stream;
        try
        {
            stream = new FileStream(path, FileMode.OpenOrCreate, FileAccess.ReadWrite, FileShare.None);
        }
        catch (IOException)
        {
            string holder = "an unknown process";
            try { holder = File.ReadAllText(holderPath).Trim(); } catch (IOException) { } catch (UnauthorizedAccessException) { }
            throw new BadInputException(outDir, null, $"another griddrift run is writing into this folder ({holder}); wait for it to end, or give the recipe another out folder");
        }
        GridDrift.Outputs.AtomicFile.WriteAllText(holderPath, $"process {Environment.ProcessId} on {Environment.MachineName}, since {DateTime.UtcNow:yyyy-MM-ddTHH:mm:ssZ}\n");
        RemoveDeadParts(outDir);
        return new RunLock(stream);
    }

    /// <summary>
    /// Removes the temporary files (.NAME.….part) that runs killed before they could rename them
    /// left in this products folder: with the lock held no other run of the folder is writing.
    /// A shard's folder has its own lock, so the shards/ below a folder are left to their own runs.
    /// </summary>
    static void RemoveDeadParts(string outDir)
    {
        string shards = Path.Combine(outDir, "shards") + Path.DirectorySeparatorChar;
        foreach (var file in Directory.EnumerateFiles(outDir, ".*", SearchOption.AllDirectories))
        {
            string name = Path.GetFileName(file);
            if (file.StartsWith(shards, StringComparison.Ordinal) || !(name.EndsWith(".part", StringComparison.Ordinal) || name.EndsWith(".part.png", StringComparison.Ordinal))) continue;
            try { File.Delete(file); } catch (IOException) { } catch (UnauthorizedAccessException) { }
        }
    }

    public void Dispose() => _stream.Dispose();
}
