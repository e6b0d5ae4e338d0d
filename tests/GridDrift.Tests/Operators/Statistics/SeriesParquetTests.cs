using DuckDB.NET.Data;
using GridDrift.Pipeline;
using GridDrift.Operators.Statistics;
using GridDrift.Tests.Support;
using GridDrift.Workflows;

namespace GridDrift.Tests.Operators.Statistics;

/// <summary>
/// The tidy Parquet table read back by DuckDB (an independent Parquet reader, test-only): column
/// types, UTC timestamps, nulls, dictionary-encoded text columns, Zstd pages and the provenance
/// key-value metadata; model calendars keep their own ISO text and have no UTC timestamp.
/// </summary>
public class SeriesParquetTests
{
    static DuckDBConnection Open() => DuckDb.Open();

    static List<object?[]> Query(DuckDBConnection c, string sql) => DuckDb.Query(c, sql);

    static string Table(TempFolder dir, string calendar, double[] hours, string statistics = "mean,std,valid", double minValid = 0.5)
    {
        string input = SampleFiles.Record(dir.File("in.nc"), hours: hours, calendar: calendar, nlat: 4, nlon: 6);
        // one missing cell makes no NaN; min-valid 0.99 on a 4 × 6 grid with a missing row would
        string table = dir.File("series.parquet");
        StatsStep.Run(new StatsOptions([input], "tcwv", ["global", "bands:90"],
            statistics.Split(',').Select(RegionStatistics.Parse).ToArray(), dir.File("series.nc"), table, minValid));
        return table;
    }

    [Fact]
    public void Columns_have_the_documented_types_and_UTC_timestamps()
    {
        using var dir = new TempFolder();
        string table = Table(dir, "standard", [0, 3, 6]);
        using var c = Open();
        var schema = Query(c, $"DESCRIBE SELECT * FROM read_parquet('{table}')").ToDictionary(r => (string)r[0]!, r => (string)r[1]!);
        Assert.Equal("VARCHAR", schema["time"]);
        Assert.Equal("TIMESTAMP WITH TIME ZONE", schema["time_utc"]);
        Assert.Equal("DOUBLE", schema["time_value"]);
        Assert.Equal("VARCHAR", schema["region"]);
        Assert.Equal("VARCHAR", schema["variable"]);
        Assert.Equal("VARCHAR", schema["quantity"]);
        Assert.Equal("DOUBLE", schema["value"]);
        Assert.Equal("DOUBLE", schema["valid_fraction"]);

        // 3 times × 3 regions (global, two bands) × 2 quantities (mean, std)
        Assert.Equal(18L, Query(c, $"SELECT count(*) FROM read_parquet('{table}')")[0][0]);
        var row = Query(c, $"SELECT time, strftime(time_utc AT TIME ZONE 'UTC', '%Y-%m-%dT%H:%M:%S'), time_value FROM read_parquet('{table}') WHERE time_value = 6 LIMIT 1")[0];
        Assert.Equal("2031-01-01T06:00:00", row[0]);
        Assert.Equal("2031-01-01T06:00:00", row[1]);
        Assert.Equal(["band_n00_n90", "band_s90_n00", "global"],
            Query(c, $"SELECT DISTINCT region FROM read_parquet('{table}') ORDER BY region").Select(r => (string)r[0]!));
    }

    [Fact]
    public void Text_columns_are_dictionary_encoded_and_pages_Zstd_compressed()
    {
        using var dir = new TempFolder();
        string table = Table(dir, "standard", [0, 3, 6]);
        using var c = Open();
        var meta = Query(c, $"SELECT path_in_schema, encodings, compression FROM parquet_metadata('{table}')");
        foreach (var column in new[] { "region", "variable", "quantity" })
            Assert.Contains("DICTIONARY", (string)meta.First(m => (string)m[0]! == column)[1]!);
        Assert.All(meta, m => Assert.Equal("ZSTD", (string)m[2]!));
    }

    [Fact]
    public void Provenance_is_in_the_key_value_metadata()
    {
        using var dir = new TempFolder();
        string table = Table(dir, "standard", [0, 3]);
        using var c = Open();
        var kv = Query(c, $"SELECT decode(key), decode(value) FROM parquet_kv_metadata('{table}')").ToDictionary(r => (string)r[0]!, r => (string)r[1]!);
        Assert.Equal("CF-1.12", kv["Conventions"]);
        Assert.Contains("in.nc", kv["input_files"]);
        Assert.Equal(64, kv["input_sha256"].Length);
        Assert.Equal(Convert.ToHexStringLower(System.Security.Cryptography.SHA256.HashData(File.ReadAllBytes(dir.File("in.nc")))), kv["input_sha256"]);
        Assert.Contains("not a warning or forecasting service", kv["caution"]);
    }

    [Theory]
    [InlineData("noleap", "2031-03-01T00:00:00")]   // 59 days after 1 January: no 29 February
    [InlineData("360_day", "2031-02-30T00:00:00")]  // 59 days after 1 January in 30-day months
    public void Model_calendars_keep_their_own_ISO_text_and_have_no_UTC_time(string calendar, string expected)
    {
        using var dir = new TempFolder();
        string table = Table(dir, calendar, [0, 59 * 24]);
        using var c = Open();
        var rows = Query(c, $"SELECT DISTINCT time, time_utc FROM read_parquet('{table}') WHERE time_value = {59 * 24}");
        var row = Assert.Single(rows);
        Assert.Equal(expected, row[0]);
        Assert.Null(row[1]);
    }

    [Fact]
    public void Regions_below_min_valid_are_null_values()
    {
        // 4 × 6 grid; at the second time the southernmost row (6 of the 12 southern cells) is missing.
        using var dir = new TempFolder();
        string input = SampleFiles.Record(dir.File("in.nc"), hours: [0, 3], nlat: 4, nlon: 6, missing: (t, cell) => t == 1 && cell < 6);
        string table = dir.File("s.parquet");
        StatsStep.Run(new StatsOptions([input], "tcwv", ["bands:90"], [RegionStatistic.Mean], dir.File("s.nc"), table, MinValid: 0.9));
        using var c = Open();
        var south = Query(c, $"SELECT time_value, value, valid_fraction FROM read_parquet('{table}') WHERE region = 'band_s90_n00' ORDER BY time_value");
        Assert.NotNull(south[0][1]);
        Assert.Null(south[1][1]);
        Assert.True((double)south[1][2]! is > 0 and < 0.9);
        var north = Query(c, $"SELECT value FROM read_parquet('{table}') WHERE region = 'band_n00_n90'");
        Assert.All(north, r => Assert.NotNull(r[0]));
    }
}
