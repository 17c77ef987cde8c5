using System.Numerics;
using System.Runtime.InteropServices;

namespace Kit.Diagnostics;

/// <summary>SIMD dot products and updates for the long contiguous columns that PCA and kNN spend their time in.</summary>
internal static class DenseKernels
{
    public static double Dot(ReadOnlySpan<double> a, ReadOnlySpan<double> b)
    {
        var va = MemoryMarshal.Cast<double, Vector<double>>(a);
        var vb = MemoryMarshal.Cast<double, Vector<double>>(b);
        var acc = Vector<double>.Zero;
        for (int i = 0; i < va.Length; i++) acc += va[i] * vb[i];
        double sum = Vector.Sum(acc);
        for (int i = va.Length * Vector<double>.Count; i < a.Length; i++) sum += a[i] * b[i];
        return sum;
    }

    /// <summary>y += alpha · x.</summary>
    public static void AddScaled(Span<double> y, double alpha, ReadOnlySpan<double> x)
    {
        var vy = MemoryMarshal.Cast<double, Vector<double>>(y);
        var vx = MemoryMarshal.Cast<double, Vector<double>>(x);
        var va = new Vector<double>(alpha);
        for (int i = 0; i < vy.Length; i++) vy[i] += va * vx[i];
        for (int i = vy.Length * Vector<double>.Count; i < y.Length; i++) y[i] += alpha * x[i];
    }

    public static double SquaredDistance(ReadOnlySpan<double> a, ReadOnlySpan<double> b)
    {
        var va = MemoryMarshal.Cast<double, Vector<double>>(a);
        var vb = MemoryMarshal.Cast<double, Vector<double>>(b);
        var acc = Vector<double>.Zero;
        for (int i = 0; i < va.Length; i++) { var d = va[i] - vb[i]; acc += d * d; }
        double sum = Vector.Sum(acc);
        for (int i = va.Length * Vector<double>.Count; i < a.Length; i++) { double d = a[i] - b[i]; sum += d * d; }
        return sum;
    }
}
