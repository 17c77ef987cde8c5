namespace Kit.Models;

/// <summary>The recurrent cell: gated (GRU, LSTM) or the plain tanh RNN.</summary>
public enum CellKind { Gru, Lstm, Rnn }

/// <summary>
/// How per-step outputs become one vector per row: the last valid step (each direction at its own end), the mean
/// or the maximum over valid steps, or additive attention over valid steps.
/// </summary>
public enum PoolingKind { Last, Mean, Max, Attention }

/// <summary>The classification head: one linear layer, or linear → ReLU → linear.</summary>
public enum HeadKind { Linear, Mlp }
