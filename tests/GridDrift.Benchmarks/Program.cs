using GridDrift.Benchmarks;

// On-demand benchmarks: each compares GridDrift with a peer measured in the same run.
//   read [--frames 400] [--dir DIR]    frame-by-frame reads, CDF-2 and deflate netCDF-4, vs python netCDF4
//   stats [FRAMES]                     region reductions of 721 × 1440 frames over 172 regions, vs numpy
//   regrid [FRAMES]                    conservative 721 × 1440 → 1°: weight build and per frame, vs scipy sparse
//   climatology [FRAMES]               monthly and hour-by-month climatologies of hourly 181 × 360 frames vs numpy group-by; memory at 1,000 and FRAMES
//   longrecord [FRAMES] [--dir DIR]   one year of hourly 0.5° frames (9.1 GB) through stats, similarity, climatology: frames/s, peak memory, where the time goes
//   similarity [PAIRS]                 SSIM and VIF of 721 × 1440 pairs vs scikit-image and numpy/scipy; memory over 100 and 10,000 frames
//   calibration [SERIES] [--hourly N]   false alarms and power of every change and trend verdict on simulated persistent seasonal series
//   native [FRAMES] [--dir DIR]       3712 × 3712 frames over 163 regions: similarity ssim,vif, vif, stats: time per pair and peak memory
//   native project [FRAMES] [--dir D] stats + similarity ssim,vif + month climatology on FRAMES deflate NetCDF-4 3712² frames: time split, 90,000-frame projection
//   limits                            each kernel's time per cell against this machine's measured vector arithmetic and memory rates
//   formats [FRAMES] [--dir DIR]       721 × 1440 frames from GRIB 2 (ecCodes) and Zarr v2 (blosc-lz4, zstd) vs python3-eccodes and python3-zarr: frames/s
//   images [FILES] [--dir DIR]         FILES one-image 500 × 500 int16 files vs the same frames stacked in one file, through stats
return args.FirstOrDefault() switch
{
    "read" => ReadBenchmark.Run(args[1..]),
    "read-one" => ReadBenchmark.ReadOne(args[1..]),
    "stats" => StatsBenchmark.Run(args[1..]),
    "similarity" => SimilarityBenchmark.Run(args[1..]),
    "similarity-one" => SimilarityBenchmark.RunOne(args[1..]),
    "climatology" => ClimatologyBenchmark.Run(args[1..]),
    "regrid" => RegridBenchmark.Run(args[1..]),
    "climatology-one" => ClimatologyBenchmark.RunOne(args[1..]),
    "longrecord" => LongRecordBenchmark.Run(args[1..]),
    "longrecord-one" => LongRecordBenchmark.RunOne(args[1..]),
    "images" => ImagesBenchmark.Run(args[1..]),
    "formats" => FormatsBenchmark.Run(args[1..]),
    "formats-one" => FormatsBenchmark.RunOne(args[1..]),
    "native" => NativeBenchmark.Run(args[1..]),
    "native-one" => NativeBenchmark.RunOne(args[1..]),
    "limits" => KernelLimits.Run(args[1..]),
    "calibration" => CalibrationBenchmark.Run(args[1..]),
    _ => Usage(),
};

static int Usage()
{
    Console.Error.WriteLine("usage: GridDrift.Benchmarks read [--frames N] [--dir DIR]");
    return 1;
}
