using DuckDB.NET.Data;

namespace GridDrift.Tests.Support;

/// <summary>DuckDB (test-only, an independent Parquet reader): an in-memory connection and whole query results.</summary>
public static class DuckDb
{
    public static DuckDBConnection Open()
    {
        var c = new DuckDBConnection("DataSource=:memory:");
        c.Open();
        return c;
    }

    /// <summary>Every row of a query, nulls as null.</summary>
    public static List<object?[]> Query(DuckDBConnection c, string sql)
    {
        using var cmd = c.CreateCommand();
        cmd.CommandText = sql;
        using var r = cmd.ExecuteReader();
        var rows = new List<object?[]>();
        while (r.Read())
        {
            var row = new object?[r.FieldCount];
            for (int i = 0; i < row.Length; i++) row[i] = r.IsDBNull(i) ? null : r.GetValue(i);
            rows.Add(row);
        }
        return rows;
    }
}
