using System.Numerics;

namespace Kit.Experiments;

/// <summary>
/// Multinomial logistic regression on sparse n-gram features, fitted by full-batch L-BFGS (Nocedal and Wright 2006,
/// Numerical Optimization, 2nd ed., Algorithm 7.4 with the two-loop recursion 7.5, memory 10) with a backtracking
/// Armijo line search. The objective is
///   Σ_i −log softmax(W x_i + b)[y_i] + (L2 / 2)·‖W‖²
/// (intercepts b not penalised); L2 = 1 is the same optimum as C = 1 in the general-purpose library's
/// formulation C·Σ loss + ½‖W‖². Everything runs in one thread in a fixed order, so a fit is bit-for-bit repeatable.
/// </summary>
public sealed class NgramLogisticRegression
{
    public int Classes { get; }
    public int Features { get; }
    public double L2 { get; }
    /// <summary>L-BFGS iterations run, and whether the gradient criterion was met before the cap.</summary>
    public int Iterations { get; }
    public bool Converged { get; }
    // Feature-major: the K weights of feature j are _weights[j*K .. j*K+K), so a sparse row reads contiguous memory.
    readonly double[] _weights;
    readonly double[] _intercepts;

    NgramLogisticRegression(int classes, int features, double l2, double[] weights, double[] intercepts, int iterations, bool converged)
    {
        Classes = classes; Features = features; L2 = l2;
        _weights = weights; _intercepts = intercepts; Iterations = iterations; Converged = converged;
    }

    public long ParameterCount => _weights.LongLength + _intercepts.Length;
    public ReadOnlySpan<double> Weights => _weights;
    public ReadOnlySpan<double> Intercepts => _intercepts;

    public static NgramLogisticRegression FromParts(int classes, int features, double l2, double[] weights, double[] intercepts)
    {
        if (weights.Length != (long)classes * features || intercepts.Length != classes)
            throw new ArgumentException($"expected {classes}×{features} weights and {classes} intercepts, got {weights.Length} and {intercepts.Length}");
        return new NgramLogisticRegression(classes, features, l2, weights, intercepts, 0, true);
    }

    /// <param name="tolerance">Stop when the largest entry of the gradient divided by the row count (the gradient of the
    /// mean loss) is below this, or when an iteration lowers the objective by less than tolerance² of its size.</param>
    public static NgramLogisticRegression Fit(SparseRows x, IReadOnlyList<int> labels, int classes, double l2 = 1.0,
        int maxIterations = 500, double tolerance = 1e-5)
    {
        if (x.Count != labels.Count) throw new ArgumentException($"{x.Count} rows but {labels.Count} labels");
        if (x.Count == 0) throw new ArgumentException("no training rows");
        if (classes < 2) throw new ArgumentOutOfRangeException(nameof(classes), $"classes = {classes}; at least 2 are needed");
        if (!(l2 > 0) || !double.IsFinite(l2)) throw new ArgumentOutOfRangeException(nameof(l2), $"L2 = {l2} must be positive");
        for (int i = 0; i < labels.Count; i++)
            if (labels[i] < 0 || labels[i] >= classes) throw new ArgumentOutOfRangeException(nameof(labels), $"labels[{i}] = {labels[i]} is outside 0..{classes - 1}");

        int k = classes, f = x.Width;
        if ((long)f * k + k > Array.MaxLength) throw new ArgumentException($"{f} features × {k} classes is too many weights");
        int size = f * k + k;
        var theta = new double[size];
        var grad = new double[size];
        double value = Objective(x, labels, k, l2, theta, grad);
        const int memory = 10;
        var s = new List<double[]>(); var y = new List<double[]>(); var rho = new List<double>();
        var direction = new double[size];
        var nextTheta = new double[size];
        var nextGrad = new double[size];
        int iteration = 0;
        bool converged = false;
        double scale = Math.Max(1, x.Count);
        while (iteration < maxIterations)
        {
            if (MaxAbs(grad) / scale < tolerance)
            {
                converged = true;
                break;
            }
            TwoLoop(grad, s, y, rho, direction);
            double slope = Dot(grad, direction);
            if (slope >= 0)
            {
                // Not a descent direction (curvature information went stale): restart from steepest descent.
                s.Clear(); y.Clear(); rho.Clear();
                for (int i = 0; i < size; i++) direction[i] = -grad[i];
                slope = Dot(grad, direction);
            }
            double step = iteration == 0 && s.Count == 0 ? 1 / Math.Max(1, Math.Sqrt(-slope)) : 1;
            double nextValue = double.NaN;
            bool accepted = false;
            for (int tries = 0; tries < 40; tries++)
            {
                Array.Copy(theta, nextTheta, size);
                Axpy(step, direction, nextTheta);
                nextValue = Objective(x, labels, k, l2, nextTheta, nextGrad);
                if (nextValue <= value + 1e-4 * step * slope) { accepted = true; break; }
                step *= 0.5;
            }
            iteration++;
            if (!accepted) break;
            // The oldest pair's arrays are reused once memory is full: no large allocation per iteration.
            double[] sk, yk;
            if (s.Count == memory) { sk = s[0]; yk = y[0]; s.RemoveAt(0); y.RemoveAt(0); rho.RemoveAt(0); }
            else { sk = new double[size]; yk = new double[size]; }
            for (int i = 0; i < size; i++) { sk[i] = nextTheta[i] - theta[i]; yk[i] = nextGrad[i] - grad[i]; }
            double sy = Dot(sk, yk);
            if (sy > 1e-12) { s.Add(sk); y.Add(yk); rho.Add(1 / sy); }
            (theta, nextTheta) = (nextTheta, theta);
            (grad, nextGrad) = (nextGrad, grad);
            double previous = value;
            value = nextValue;
            if (previous - value <= tolerance * tolerance * Math.Max(1, Math.Abs(value))) { converged = true; break; }
        }
        var weights = new double[(long)f * k];
        Array.Copy(theta, weights, weights.LongLength);
        var intercepts = theta.AsSpan((int)((long)f * k), k).ToArray();
        return new NgramLogisticRegression(k, f, l2, weights, intercepts, iteration, converged);
    }

    /// <summary>Class probabilities of one feature row.</summary>
    public double[] Probabilities(ReadOnlySpan<int> columns, ReadOnlySpan<double> values)
    {
        var z = new double[Classes];
        Scores(_weights, _intercepts, Classes, columns, values, z);
        Softmax(z);
        return z;
    }

    public double[][] Probabilities(SparseRows x) =>
        Enumerable.Range(0, x.Count).Select(r => Probabilities(x.ColumnsOf(r), x.ValuesOf(r))).ToArray();

    static void Scores(ReadOnlySpan<double> w, ReadOnlySpan<double> b, int k, ReadOnlySpan<int> columns, ReadOnlySpan<double> values, Span<double> z)
    {
        b.CopyTo(z);
        for (int t = 0; t < columns.Length; t++)
        {
            var row = w.Slice(columns[t] * k, k);
            double v = values[t];
            for (int c = 0; c < k; c++) z[c] += v * row[c];
        }
    }

    static void Softmax(Span<double> z)
    {
        double max = double.NegativeInfinity;
        foreach (double v in z) max = Math.Max(max, v);
        double sum = 0;
        for (int c = 0; c < z.Length; c++) sum += z[c] = Math.Exp(z[c] - max);
        for (int c = 0; c < z.Length; c++) z[c] /= sum;
    }

    /// <summary>The objective at theta (weights then intercepts) and its gradient into grad.</summary>
    static double Objective(SparseRows x, IReadOnlyList<int> labels, int k, double l2, double[] theta, double[] grad)
    {
        long wLength = (long)x.Width * k;
        var w = theta.AsSpan(0, (int)wLength);
        var b = theta.AsSpan((int)wLength, k);
        var gw = grad.AsSpan(0, (int)wLength);
        var gb = grad.AsSpan((int)wLength, k);
        double loss = 0;
        for (int i = 0; i < w.Length; i++) { gw[i] = l2 * w[i]; loss += 0.5 * l2 * w[i] * w[i]; }
        gb.Clear();
        Span<double> z = stackalloc double[k];
        for (int r = 0; r < x.Count; r++)
        {
            var columns = x.ColumnsOf(r);
            var values = x.ValuesOf(r);
            Scores(w, b, k, columns, values, z);
            int y = labels[r];
            double max = double.NegativeInfinity;
            foreach (double v in z) max = Math.Max(max, v);
            double sum = 0;
            for (int c = 0; c < k; c++) sum += Math.Exp(z[c] - max);
            loss += max + Math.Log(sum) - z[y];
            for (int c = 0; c < k; c++) z[c] = Math.Exp(z[c] - max) / sum;
            z[y] -= 1;
            for (int c = 0; c < k; c++) gb[c] += z[c];
            for (int t = 0; t < columns.Length; t++)
            {
                var g = gw.Slice(columns[t] * k, k);
                double v = values[t];
                for (int c = 0; c < k; c++) g[c] += v * z[c];
            }
        }
        return loss;
    }

    static void TwoLoop(double[] grad, List<double[]> s, List<double[]> y, List<double> rho, double[] direction)
    {
        int size = grad.Length;
        for (int i = 0; i < size; i++) direction[i] = -grad[i];
        int m = s.Count;
        var alpha = new double[m];
        for (int j = m - 1; j >= 0; j--)
        {
            alpha[j] = rho[j] * Dot(s[j], direction);
            Axpy(-alpha[j], y[j], direction);
        }
        if (m > 0)
        {
            double gamma = Dot(s[m - 1], y[m - 1]) / Dot(y[m - 1], y[m - 1]);
            for (int i = 0; i < size; i++) direction[i] *= gamma;
        }
        for (int j = 0; j < m; j++)
        {
            double beta = rho[j] * Dot(y[j], direction);
            Axpy(alpha[j] - beta, s[j], direction);
        }
    }

    // Vector<double> loops: the solver's time outside the objective is these passes over every weight.
    static double Dot(double[] a, double[] b)
    {
        int n = a.Length, w = Vector<double>.Count, i = 0;
        var acc = Vector<double>.Zero;
        for (; i <= n - w; i += w) acc += new Vector<double>(a, i) * new Vector<double>(b, i);
        double sum = Vector.Sum(acc);
        for (; i < n; i++) sum += a[i] * b[i];
        return sum;
    }

    static void Axpy(double a, double[] x, double[] y)
    {
        int n = x.Length, w = Vector<double>.Count, i = 0;
        var va = new Vector<double>(a);
        for (; i <= n - w; i += w) (new Vector<double>(y, i) + va * new Vector<double>(x, i)).CopyTo(y, i);
        for (; i < n; i++) y[i] += a * x[i];
    }

    static double MaxAbs(double[] a)
    {
        double m = 0;
        foreach (double v in a) m = Math.Max(m, Math.Abs(v));
        return m;
    }
}
