using GridDrift.Tests.Support;

namespace GridDrift.Tests.Outputs;

/// <summary>
/// The tidy Parquet table carries each quantity's units, the same the NetCDF series gives as its
/// variables' units attribute (DuckDB reads the table, netCDF-C's ncdump the series), and valid
/// fractions never exceed 1 (an area fraction; summing cell areas in another order overshot by
/// 5e-13).
/// </summary>
public class TableUnitsTests
{
    [InteropFact(Needs.Ncdump)]
    public void Table_units_match_the_series_and_fractions_stay_within_one()
    {
        using var dir = new TempFolder();
        string input = SampleFiles.Record(dir.File("in.nc"), frames: 24, nlat: 36, nlon: 72);
        var outcome = CliRun.Run("stats", input, "--var", "tcwv", "--regions", "global", "bands:10", "tiles:30x30", "--out", dir.File("s.nc"), "--table", dir.File("s.parquet"), "--quiet");
        Assert.True(outcome.ExitCode == 0, outcome.Stderr);
        string header = ExternalTools.Run("ncdump", $"-h \"{dir.File("s.nc")}\"").Stdout;
        using var db = DuckDb.Open();
        var rows = DuckDb.Query(db, $"SELECT DISTINCT quantity, units FROM read_parquet('{dir.File("s.parquet")}') ORDER BY quantity");
        Assert.NotEmpty(rows);
        foreach (var row in rows)
            Assert.Contains($"\t\t{row[0]}:units = \"{row[1]}\" ;", header);
        var max = DuckDb.Query(db, $"SELECT max(valid_fraction), min(valid_fraction) FROM read_parquet('{dir.File("s.parquet")}') WHERE NOT isnan(valid_fraction)")[0];
        Assert.True(Convert.ToDouble(max[0]) <= 1 && Convert.ToDouble(max[1]) >= 0, $"valid fractions from {max[1]} to {max[0]}");
    }
}
