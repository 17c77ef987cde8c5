namespace Kit.Models;

/// <summary>
/// The sequence encoder family: recurrent cells, a 1-D convolution over several widths (Kim 2014), or a small
/// Transformer encoder (Vaswani et al. 2017).
/// </summary>
public enum EncoderKind { Recurrent, Convolution, Transformer }

/// <summary>How a Transformer encoder knows token positions: fixed sinusoids (Vaswani et al. 2017, §3.5) or a learned table.</summary>
public enum PositionKind { Sinusoidal, Learned }

/// <summary>The recurrent cell: gated (GRU, LSTM) or the plain tanh RNN.</summary>
public enum CellKind { Gru, Lstm, Rnn }

/// <summary>
/// How per-step outputs become one vector per row: the last valid step (each direction at its own end), the mean
/// or the maximum over valid steps, or additive attention over valid steps.
/// </summary>
public enum PoolingKind { Last, Mean, Max, Attention }

/// <summary>The classification head: one linear layer, or linear → ReLU → linear.</summary>
public enum HeadKind { Linear, Mlp }
