namespace Kit.Diagnostics;

/// <summary>
/// Point-region quadtree over the 2-D layout for the Barnes–Hut approximation of t-SNE's repulsive forces
/// (Barnes and Hut 1986; van der Maaten 2014, section 4.2). Nodes live in flat arrays, children of a node in
/// four consecutive slots, so a rebuild every iteration allocates nothing once the arrays have grown.
/// Coincident points share a leaf (its mass counts them all) instead of splitting forever.
/// </summary>
internal sealed class QuadTree
{
    double[] _cx = [], _cy = [], _half = [], _comX = [], _comY = [];
    int[] _mass = [], _child = [], _point = [];
    int _nodes;

    public int NodeCount => _nodes;

    public void Build(double[] y)
    {
        int n = y.Length / 2;
        Ensure(Math.Max(16, 4 * n + 1));
        double minX = double.PositiveInfinity, minY = double.PositiveInfinity, maxX = double.NegativeInfinity, maxY = double.NegativeInfinity;
        for (int i = 0; i < n; i++)
        {
            minX = Math.Min(minX, y[2 * i]); maxX = Math.Max(maxX, y[2 * i]);
            minY = Math.Min(minY, y[2 * i + 1]); maxY = Math.Max(maxY, y[2 * i + 1]);
        }
        double half = Math.Max(maxX - minX, maxY - minY) / 2;
        half = half * (1 + 1e-9) + 1e-12; // strictly contain the extreme points
        _nodes = 0;
        NewNode((minX + maxX) / 2, (minY + maxY) / 2, half);
        for (int i = 0; i < n; i++) Insert(y, i);
        for (int c = 0; c < _nodes; c++)
            if (_mass[c] > 0) { _comX[c] /= _mass[c]; _comY[c] /= _mass[c]; }
    }

    void Insert(double[] y, int p)
    {
        double px = y[2 * p], py = y[2 * p + 1];
        int node = 0;
        while (true)
        {
            _mass[node]++;
            _comX[node] += px; _comY[node] += py;
            if (_child[node] >= 0) { node = _child[node] + Quadrant(node, px, py); continue; }
            if (_mass[node] == 1) { _point[node] = p; return; }
            int existing = _point[node];
            if (y[2 * existing] == px && y[2 * existing + 1] == py) return;
            // Split: the earlier occupant(s) move down into their quadrant, then the new point carries on.
            int first = _nodes;
            double h = _half[node] / 2, cx = _cx[node], cy = _cy[node];
            NewNode(cx - h, cy - h, h); NewNode(cx + h, cy - h, h); NewNode(cx - h, cy + h, h); NewNode(cx + h, cy + h, h);
            _child[node] = first;
            int moved = first + Quadrant(node, y[2 * existing], y[2 * existing + 1]);
            int occupants = _mass[node] - 1;
            _mass[moved] = occupants;
            _comX[moved] = occupants * y[2 * existing]; _comY[moved] = occupants * y[2 * existing + 1];
            _point[moved] = existing;
            _point[node] = -1;
            node = first + Quadrant(node, px, py);
        }
    }

    int Quadrant(int node, double px, double py) => (px >= _cx[node] ? 1 : 0) + (py >= _cy[node] ? 2 : 0);

    void NewNode(double cx, double cy, double half)
    {
        if (_nodes == _cx.Length) Ensure(_nodes * 2);
        int c = _nodes++;
        _cx[c] = cx; _cy[c] = cy; _half[c] = half;
        _comX[c] = 0; _comY[c] = 0; _mass[c] = 0; _child[c] = -1; _point[c] = -1;
    }

    void Ensure(int capacity)
    {
        if (_cx.Length >= capacity) return;
        Array.Resize(ref _cx, capacity); Array.Resize(ref _cy, capacity); Array.Resize(ref _half, capacity);
        Array.Resize(ref _comX, capacity); Array.Resize(ref _comY, capacity);
        Array.Resize(ref _mass, capacity); Array.Resize(ref _child, capacity); Array.Resize(ref _point, capacity);
    }

    /// <summary>
    /// Repulsion on a point at (px, py): Σ_j q_ij² (y_i − y_j) and Σ_j q_ij with q_ij = 1 / (1 + ‖y_i − y_j‖²), the
    /// point itself excluded, cells with (width / distance) &lt; θ taken as one mass at their centre.
    /// <paramref name="stack"/> is per caller so threads can share the tree.
    /// </summary>
    public (double Fx, double Fy, double Z) Repulsion(double px, double py, double theta, ref int[] stack)
    {
        double fx = 0, fy = 0, z = 0, theta2 = theta * theta;
        int top = 0;
        stack[top++] = 0;
        while (top > 0)
        {
            int node = stack[--top];
            int mass = _mass[node];
            if (mass == 0) continue;
            double dx = px - _comX[node], dy = py - _comY[node], d2 = dx * dx + dy * dy;
            bool leaf = _child[node] < 0;
            if (leaf && d2 == 0) { z += mass - 1; continue; } // the point itself, plus any exact duplicates
            double width = 2 * _half[node];
            if (leaf || width * width < theta2 * d2)
            {
                double q = 1 / (1 + d2), mq = mass * q;
                z += mq;
                fx += mq * q * dx; fy += mq * q * dy;
                continue;
            }
            if (top + 4 > stack.Length) Array.Resize(ref stack, stack.Length * 2);
            int first = _child[node];
            stack[top++] = first; stack[top++] = first + 1; stack[top++] = first + 2; stack[top++] = first + 3;
        }
        return (fx, fy, z);
    }

    public static int[] NewStack() => new int[256];
}
