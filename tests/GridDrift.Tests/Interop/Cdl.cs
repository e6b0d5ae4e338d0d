namespace GridDrift.Tests.Interop;

/// <summary>CDL texts handed to netCDF-C's ncgen to make reference files in every format variant.</summary>
public static class Cdl
{
    /// <summary>Record and fixed variables of the classic types, packed int16 with a fill, char text.</summary>
    public static string Common(bool cdf5Types, bool deflate) => $$"""
        netcdf variants {
        dimensions:
          time = UNLIMITED ;
          lat = 3 ;
          lon = 5 ;
          strlen = 6 ;
        variables:
          double time(time) ;
            time:units = "hours since 2031-01-01 00:00:00" ;
            time:calendar = "noleap" ;
            time:standard_name = "time" ;
          float lat(lat) ;
            lat:units = "degrees_north" ;
          float lon(lon) ;
            lon:units = "degrees_east" ;
          byte flag(time, lat) ;
          short counts(time, lat, lon) ;
          int station(lat, lon) ;
          float tb(time, lat, lon) ;
            tb:_FillValue = -999.f ;
            tb:units = "K" ;
            tb:valid_min = 150.f ;
            {{(deflate ? "tb:_Storage = \"chunked\" ; tb:_ChunkSizes = 1, 3, 5 ; tb:_DeflateLevel = 4 ; tb:_Shuffle = \"true\" ;" : "")}}
          double weight(lat) ;
          char label(lat, strlen) ;
          short tcwv(time, lat, lon) ;
            tcwv:scale_factor = 0.002 ;
            tcwv:add_offset = 40. ;
            tcwv:_FillValue = -32767s ;
            tcwv:units = "kg m-2" ;
            {{(deflate ? "tcwv:_Storage = \"chunked\" ; tcwv:_ChunkSizes = 1, 3, 5 ; tcwv:_DeflateLevel = 6 ; tcwv:_Shuffle = \"true\" ;" : "")}}
          {{(cdf5Types ? "ubyte ub(lat) ; ushort us(lat) ; uint ui(lat) ; int64 i64(lat) ; uint64 u64(lat) ;" : "")}}

        // global attributes:
          :title = "GridDrift format-variant reference (invented values)" ;
          :Conventions = "CF-1.12" ;
          :answer = 42 ;
          :ratio = 0.5, 1.5 ;
        data:
          time = 0, 3, 6, 9 ;
          lat = -30, 0, 30 ;
          lon = 0, 72, 144, 216, 288 ;
          flag = 1, -2, 3, 4, 5, -6, 7, 8, 9, -10, 11, 12 ;
          counts = {{Series(60, i => (i * 37 % 200 - 100).ToString())}} ;
          station = {{Series(15, i => (i * 1000003 - 7000000).ToString())}} ;
          tb = {{Series(60, i => i % 11 == 3 ? "_" : i % 13 == 5 ? "120" : (200 + i * 1.25).ToString(System.Globalization.CultureInfo.InvariantCulture))}} ;
          weight = 0.25, 0.5, 0.25 ;
          label = "south", "equat", "north" ;
          tcwv = {{Series(60, i => i % 9 == 4 ? "_" : (i * 523 % 20000 - 10000).ToString())}} ;
          {{(cdf5Types ? "ub = 0, 128, 255 ; us = 1, 40000, 65534 ; ui = 7, 3000000000, 4294967290 ; i64 = -9000000000000000000, 0, 9000000000000000000 ; u64 = 1, 10000000000000000000, 18000000000000000000 ;" : "")}}
        }
        """;

    /// <summary>One record variable of a short type: the classic format's unpadded-record special case.</summary>
    public const string SingleRecordVariable = """
        netcdf single {
        dimensions:
          time = UNLIMITED ;
          n = 3 ;
        variables:
          short x(time, n) ;
        data:
          x = 1, 2, 3, 4, 5, 6, 7, 8, 9, 10, 11, 12, 13, 14, 15 ;
        }
        """;

    static string Series(int n, Func<int, string> value) => string.Join(", ", Enumerable.Range(0, n).Select(value));
}
