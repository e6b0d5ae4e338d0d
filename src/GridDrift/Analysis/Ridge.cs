using MathNet.Numerics.LinearAlgebra;

namespace GridDrift.Analysis;

/// <summary>
/// Ridge regression (Hoerl &amp; Kennard 1970) of a target on predictors, all standardized
/// (mean 0, standard deviation 1 over the fitting rows), with no intercept on the standardized
/// scale: w = (ZᵀZ + λ n I)⁻¹ Zᵀy. λ is chosen from a log grid by time-blocked cross-validation:
/// the rows are cut into <c>folds</c> contiguous blocks, each held out in turn, so neighbouring
/// (autocorrelated) times never sit on both sides of a split.
/// </summary>
internal sealed class Ridge
{
    public double[] Weights { get; }
    public double[] Mean { get; }
    public double[] Scale { get; }
    public double TargetMean { get; }
    public double TargetScale { get; }
    public double Lambda { get; }

    Ridge(double[] w, double[] mean, double[] scale, double ym, double ys, double lambda)
    {
        Weights = w; Mean = mean; Scale = scale; TargetMean = ym; TargetScale = ys; Lambda = lambda;
    }

    public static readonly double[] LambdaGrid = Enumerable.Range(0, 15).Select(k => Math.Pow(10, -5 + 0.5 * k)).ToArray();

    /// <param name="x">rows × predictors, row-major</param>
    public static Ridge Fit(double[,] x, double[] y, int folds = 5, double? lambda = null)
    {
        int n = y.Length;
        double chosen = lambda ?? ChooseLambda(x, y, folds);
        return FitRows(x, y, Enumerable.Range(0, n).ToArray(), chosen);
    }

    static Ridge FitRows(double[,] x, double[] y, int[] rows, double lambda)
    {
        int p = x.GetLength(1), n = rows.Length;
        var mean = new double[p];
        var scale = new double[p];
        for (int j = 0; j < p; j++)
        {
            double m = rows.Average(r => x[r, j]);
            double s = Math.Sqrt(rows.Sum(r => (x[r, j] - m) * (x[r, j] - m)) / n);
            mean[j] = m;
            scale[j] = s > 0 ? s : 1;
        }
        double ym = rows.Average(r => y[r]);
        double ys = Math.Sqrt(rows.Sum(r => (y[r] - ym) * (y[r] - ym)) / n);
        if (!(ys > 0)) ys = 1;
        var z = Matrix<double>.Build.Dense(n, p, (i, j) => (x[rows[i], j] - mean[j]) / scale[j]);
        var t = Vector<double>.Build.Dense(n, i => (y[rows[i]] - ym) / ys);
        var normal = z.TransposeThisAndMultiply(z) + Matrix<double>.Build.DenseIdentity(p) * (lambda * n);
        var w = normal.Cholesky().Solve(z.TransposeThisAndMultiply(t));
        return new Ridge(w.ToArray(), mean, scale, ym, ys, lambda);
    }

    static double ChooseLambda(double[,] x, double[] y, int folds)
    {
        int n = y.Length;
        folds = Math.Clamp(folds, 2, Math.Max(2, n / 10));
        double best = double.PositiveInfinity, chosen = LambdaGrid[0];
        foreach (double lambda in LambdaGrid)
        {
            double error = 0;
            for (int f = 0; f < folds; f++)
            {
                int lo = f * n / folds, hi = (f + 1) * n / folds;
                var train = Enumerable.Range(0, n).Where(i => i < lo || i >= hi).ToArray();
                var model = FitRows(x, y, train, lambda);
                for (int i = lo; i < hi; i++)
                {
                    double e = model.Predict(x, i) - y[i];
                    error += e * e;
                }
            }
            if (error < best) { best = error; chosen = lambda; }
        }
        return chosen;
    }

    /// <summary>The prediction for one row, on the target's own scale.</summary>
    public double Predict(double[,] x, int row)
    {
        double s = 0;
        for (int j = 0; j < Weights.Length; j++) s += Weights[j] * (x[row, j] - Mean[j]) / Scale[j];
        return TargetMean + TargetScale * s;
    }

    /// <summary>
    /// Exact Shapley values of the linear model for one row (Shapley 1953; for a linear model with
    /// features taken independent, Lundberg &amp; Lee 2017): φ_j = β_j (x_j − E[x_j]) with β_j the
    /// weight on the original scale; they sum to f(x) − E[f(X)].
    /// </summary>
    public void Shapley(double[,] x, int row, Span<double> phi)
    {
        for (int j = 0; j < Weights.Length; j++) phi[j] = TargetScale * Weights[j] / Scale[j] * (x[row, j] - Mean[j]);
    }
}
