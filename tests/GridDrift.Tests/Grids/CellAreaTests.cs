using GridDrift.Grids;

namespace GridDrift.Tests.Grids;

/// <summary>Cell areas on the sphere against closed forms of spherical geometry.</summary>
public class CellAreaTests
{
    const double R = Sphere.MeanEarthRadius;
    static readonly double SphereArea = 4 * Math.PI * R * R;

    static double[] Range(double start, double step, int n) => Enumerable.Range(0, n).Select(i => start + step * i).ToArray();

    [Fact]
    public void The_cells_of_a_global_quarter_degree_grid_sum_to_four_pi_R_squared()
    {
        // Surface of a sphere, 4πR² (Archimedes). 721 × 1440 cells, centred on the poles: the polar rows are half cells.
        var grid = RectilinearGrid.Build(Range(90, -0.25, 721), Range(0, 0.25, 1440));
        Assert.Equal(1, grid.CellArea.Sum() / SphereArea, 12);
    }

    [Fact]
    public void The_cells_of_an_uneven_latitude_grid_sum_to_four_pi_R_squared()
    {
        double[] lat = [-85, -70.5, -52, -31.7, -10.2, 10.2, 31.7, 52, 70.5, 85]; // uneven, like Gaussian latitudes
        var grid = RectilinearGrid.Build(lat, Range(0, 30, 12));
        Assert.Equal(1, grid.CellArea.Sum() / SphereArea, 12);
    }

    [Fact]
    public void A_cell_centred_on_the_pole_is_the_half_cell_of_the_zone_formula()
    {
        // Zone area 2πR²(sin φ₂ − sin φ₁) per 360°: the polar cap above 89.625° spread over 480 columns.
        var grid = RectilinearGrid.Build(Range(90, -0.75, 241), Range(-180, 0.75, 480));
        double expected = 2 * Math.PI * R * R * (1 - Math.Sin(89.625 * Math.PI / 180)) / 480;
        Assert.Equal(1, grid.CellArea[0] / expected, 12);
        // cos-latitude weights would give this cell zero weight: exact areas must not
        Assert.True(grid.CellArea[0] > 0);
    }

    [Fact]
    public void A_spherical_triangle_with_three_right_angles_is_one_eighth_of_the_sphere()
    {
        // Girard's theorem: area = R² (A + B + C − π) = R² π/2 for three right angles.
        double area = Sphere.PolygonArea([0, 0, 90], [0, 90, 0], R);
        Assert.Equal(1, area / (SphereArea / 8), 12);
    }

    [Fact]
    public void A_latitude_longitude_rectangle_has_the_zone_area_share_of_its_longitudes()
    {
        double area = Sphere.RectangleArea(10, 40, 30, R);
        Assert.Equal(1, area / (2 * Math.PI * R * R * (Math.Sin(40 * Math.PI / 180) - Math.Sin(10 * Math.PI / 180)) / 12), 12);
    }

    [Fact]
    public void Curvilinear_cells_of_a_rotated_copy_of_a_regular_grid_sum_to_its_area()
    {
        // A regular 2° grid between 20°S and 20°N seen as a curvilinear grid: the quadrilaterals
        // between great circles differ from lat-lon rectangles, so compare the total with the
        // zone area to the accuracy of the corner rule (cells of 2°: about 1e-4).
        int rows = 20, columns = 180;
        var lat = new double[rows * columns];
        var lon = new double[rows * columns];
        for (int j = 0; j < rows; j++)
            for (int i = 0; i < columns; i++)
            {
                lat[j * columns + i] = -19 + 2 * j;
                lon[j * columns + i] = 1 + 2 * i;
            }
        var grid = CurvilinearGrid.Build(lat, lon, rows, columns);
        double zone = 2 * Math.PI * R * R * 2 * Math.Sin(20 * Math.PI / 180);
        Assert.Equal(1, grid.CellArea.Sum() / zone, 3);
    }
}
