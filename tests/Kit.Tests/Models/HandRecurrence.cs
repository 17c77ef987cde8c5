namespace Kit.Tests.Models;

/// <summary>
/// Recurrent cells written out step by step in double precision from the published equations, reading weights
/// in the engine's layout: W_ih [G·H, In], W_hh [G·H, H], b_ih and b_hh [G·H], gate blocks stacked in the order
/// the TorchSharp / PyTorch documentation gives (GRU: r, z, n; LSTM: i, f, g, o).
/// </summary>
internal sealed record CellWeights(float[] Wih, float[] Whh, float[] Bih, float[] Bhh, int Input, int Hidden);

internal static class HandRecurrence
{
    static double Sigmoid(double v) => 1 / (1 + Math.Exp(-v));

    /// <summary>Row <paramref name="row"/> of W x + b, for a matrix stored row-major with <paramref name="cols"/> columns.</summary>
    static double Affine(float[] w, float[] b, int row, int cols, double[] x)
    {
        double s = b[row];
        for (int k = 0; k < cols; k++) s += w[row * cols + k] * x[k];
        return s;
    }

    /// <summary>
    /// GRU, Cho et al. 2014 ("Learning Phrase Representations using RNN Encoder–Decoder…", eqs. 5–8; equation
    /// numbers from memory), with the
    /// reset gate placed as the engine documents it (torch.nn.GRU / TorchSharp GRU): r multiplies (W_hn h + b_hn)
    /// after the matrix product, n = tanh(W_in x + b_in + r ⊙ (W_hn h + b_hn)); h' = (1 − z) ⊙ n + z ⊙ h.
    /// </summary>
    public static double[][] Gru(CellWeights w, IReadOnlyList<double[]> xs) => Unroll(xs, w.Hidden, (x, state) =>
    {
        int h = w.Hidden;
        var next = new double[h];
        for (int j = 0; j < h; j++)
        {
            double r = Sigmoid(Affine(w.Wih, w.Bih, j, w.Input, x) + Affine(w.Whh, w.Bhh, j, h, state));
            double z = Sigmoid(Affine(w.Wih, w.Bih, h + j, w.Input, x) + Affine(w.Whh, w.Bhh, h + j, h, state));
            double n = Math.Tanh(Affine(w.Wih, w.Bih, 2 * h + j, w.Input, x) + r * Affine(w.Whh, w.Bhh, 2 * h + j, h, state));
            next[j] = (1 - z) * n + z * state[j];
        }
        return next;
    });

    /// <summary>
    /// LSTM with forget gate: Hochreiter &amp; Schmidhuber 1997 ("Long Short-Term Memory"), forget gate from Gers,
    /// Schmidhuber &amp; Cummins 2000 ("Learning to Forget"), no peepholes, as torch.nn.LSTM documents it:
    /// c' = f ⊙ c + i ⊙ g, h' = o ⊙ tanh(c'), with i, f, o sigmoid gates and g = tanh(…).
    /// Returns the hidden outputs per step and the last cell state.
    /// </summary>
    public static (double[][] Outputs, double[] Cell) Lstm(CellWeights w, IReadOnlyList<double[]> xs)
    {
        int h = w.Hidden;
        var state = new double[h];
        var cell = new double[h];
        var outputs = new List<double[]>();
        foreach (var x in xs)
        {
            var nextH = new double[h];
            var nextC = new double[h];
            for (int j = 0; j < h; j++)
            {
                double Gate(int block) => Affine(w.Wih, w.Bih, block * h + j, w.Input, x) + Affine(w.Whh, w.Bhh, block * h + j, h, state);
                double i = Sigmoid(Gate(0)), f = Sigmoid(Gate(1)), g = Math.Tanh(Gate(2)), o = Sigmoid(Gate(3));
                nextC[j] = f * cell[j] + i * g;
                nextH[j] = o * Math.Tanh(nextC[j]);
            }
            state = nextH;
            cell = nextC;
            outputs.Add(nextH);
        }
        return (outputs.ToArray(), cell);
    }

    /// <summary>Plain tanh RNN (Elman 1990, "Finding Structure in Time"): h' = tanh(W_ih x + b_ih + W_hh h + b_hh).</summary>
    public static double[][] Elman(CellWeights w, IReadOnlyList<double[]> xs) => Unroll(xs, w.Hidden, (x, state) =>
        Enumerable.Range(0, w.Hidden)
            .Select(j => Math.Tanh(Affine(w.Wih, w.Bih, j, w.Input, x) + Affine(w.Whh, w.Bhh, j, w.Hidden, state)))
            .ToArray());

    /// <summary>Applies a step (input, previous state) → new state from a zero state; returns every state.</summary>
    static double[][] Unroll(IReadOnlyList<double[]> xs, int hidden, Func<double[], double[], double[]> step)
    {
        var state = new double[hidden];
        var outputs = new double[xs.Count][];
        for (int t = 0; t < xs.Count; t++) outputs[t] = state = step(xs[t], state);
        return outputs;
    }
}
