using GridDrift.Formats;
using GridDrift.Operators.Similarity;

namespace GridDrift.Tests.Operators.Similarity;

/// <summary>
/// SSIM's fixed dynamic range L from a variable's CF attributes (CF Conventions §8.1: valid_range,
/// valid_min and valid_max are in packed units when they have the variable's own packed type, and
/// in physical units when they have the type of scale_factor).
/// </summary>
public class DataRangeTests
{
    static NcVariable Variable(NcType type, params NcAttribute[] attributes) => new("tb", type, [new NcDimension("x", 4, false)], attributes);

    [Fact]
    public void A_packed_valid_range_is_unpacked()
    {
        // short storage, scale 0.01, offset 250: raw −7000 … 7000 is 180 … 320 K
        var v = Variable(NcType.Short, NcAttribute.Of("scale_factor", 0.01f), NcAttribute.Of("add_offset", 250f), NcAttribute.Of("valid_range", (short)-7000, (short)7000));
        var range = DataRange.Resolve(null, v, "f.nc");
        Assert.Equal(180, range.Low, 4);
        Assert.Equal(320, range.High, 4);
    }

    [Fact]
    public void A_valid_range_of_the_scale_type_is_already_physical()
    {
        var v = Variable(NcType.Short, NcAttribute.Of("scale_factor", 0.01f), NcAttribute.Of("add_offset", 250f), NcAttribute.Of("valid_min", 190f), NcAttribute.Of("valid_max", 310f));
        var range = DataRange.Resolve(null, v, "f.nc");
        Assert.Equal(190, range.Low, 4);
        Assert.Equal(310, range.High, 4);
    }

    [Fact]
    public void Without_a_valid_range_the_standard_name_default_applies()
    {
        var v = Variable(NcType.Float, NcAttribute.Text("standard_name", "atmosphere_mass_content_of_water_vapor"));
        var range = DataRange.Resolve(null, v, "f.nc");
        Assert.Equal((0.0, 80.0), (range.Low, range.High)); // the documented default (docs/methods.md), common practice for TCWV in kg m-2
    }
}
