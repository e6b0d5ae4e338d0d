using GridDrift.Frames;
using GridDrift.Grids;

namespace GridDrift.Results;

/// <summary>Everything `describe` reports of one file, format-blind.</summary>
internal sealed record FileDescription(
    string Path,
    string Format,
    IReadOnlyList<DimensionDescription> Dimensions,
    IReadOnlyList<VariableDescription> Variables,
    IReadOnlyList<AttributeDescription> GlobalAttributes,
    TimeDescription? Time,
    HorizontalGrid? Grid,
    IReadOnlyList<string> Warnings);

internal sealed record DimensionDescription(string Name, long Length, bool IsUnlimited);

internal sealed record AttributeDescription(string Name, string Type, string Value);

internal sealed record VariableDescription(
    string Name, string Type, IReadOnlyList<string> Dimensions, IReadOnlyList<long> Shape,
    string? Units, string? StandardName, string? LongName, string Role,
    IReadOnlyList<AttributeDescription> Attributes);

internal sealed record TimeDescription(
    string Variable, string Calendar, string Units, string First, string Last, int Count,
    string? Step, string? StepText, IReadOnlyList<TimeGap> Gaps);

/// <summary>Several files that split one record along time.</summary>
internal sealed record RecordDescription(string Variable, IReadOnlyList<string> Files, TimeDescription Time);
