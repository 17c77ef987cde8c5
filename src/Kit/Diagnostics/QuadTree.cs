using System.Runtime.InteropServices;

namespace Kit.Diagnostics;

/// <summary>
/// Point-region quadtree over the 2-D layout for the Barnes–Hut approximation of t-SNE's repulsive forces
/// (Barnes and Hut 1986; van der Maaten 2014, section 4.2). Nodes live in one flat array of small structs,
/// children of a node in four consecutive slots, so the force walk touches one cache line per node and a
/// rebuild every iteration allocates nothing once the array has grown. Coincident points share a leaf (its
/// mass counts them all) instead of splitting forever.
/// </summary>
internal sealed class QuadTree
{
    [StructLayout(LayoutKind.Sequential)]
    struct Node
    {
        public double ComX, ComY;   // sums while building, centre of mass afterwards
        public double Width2;       // squared side length, for the θ test
        public int Mass;
        public int Child;           // first of four children, −1 for a leaf
    }

    Node[] _node = [];
    double[] _cx = [], _cy = [], _half = [];   // only needed while building
    int[] _point = [];
    int _nodes;

    public int NodeCount => _nodes;

    public void Build(double[] y)
    {
        int n = y.Length / 2;
        Ensure(Math.Max(16, 2 * n + 1));
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
        {
            ref var node = ref _node[c];
            if (node.Mass > 0) { node.ComX /= node.Mass; node.ComY /= node.Mass; }
        }
    }

    void Insert(double[] y, int p)
    {
        double px = y[2 * p], py = y[2 * p + 1];
        int at = 0;
        while (true)
        {
            _node[at].Mass++;
            _node[at].ComX += px; _node[at].ComY += py;
            if (_node[at].Child >= 0) { at = _node[at].Child + Quadrant(at, px, py); continue; }
            if (_node[at].Mass == 1) { _point[at] = p; return; }
            int existing = _point[at];
            if (y[2 * existing] == px && y[2 * existing + 1] == py) return;
            // Split: the earlier occupant(s) move down into their quadrant, then the new point carries on.
            int first = _nodes;
            double h = _half[at] / 2, cx = _cx[at], cy = _cy[at];
            NewNode(cx - h, cy - h, h); NewNode(cx + h, cy - h, h); NewNode(cx - h, cy + h, h); NewNode(cx + h, cy + h, h);
            _node[at].Child = first;
            int moved = first + Quadrant(at, y[2 * existing], y[2 * existing + 1]);
            int occupants = _node[at].Mass - 1;
            _node[moved].Mass = occupants;
            _node[moved].ComX = occupants * y[2 * existing]; _node[moved].ComY = occupants * y[2 * existing + 1];
            _point[moved] = existing;
            _point[at] = -1;
            at = first + Quadrant(at, px, py);
        }
    }

    int Quadrant(int node, double px, double py) => (px >= _cx[node] ? 1 : 0) + (py >= _cy[node] ? 2 : 0);

    void NewNode(double cx, double cy, double half)
    {
        if (_nodes == _node.Length) Ensure(_nodes * 2);
        int c = _nodes++;
        _cx[c] = cx; _cy[c] = cy; _half[c] = half; _point[c] = -1;
        _node[c] = new Node { Width2 = 4 * half * half, Child = -1 };
    }

    void Ensure(int capacity)
    {
        if (_node.Length >= capacity) return;
        Array.Resize(ref _node, capacity);
        Array.Resize(ref _cx, capacity); Array.Resize(ref _cy, capacity); Array.Resize(ref _half, capacity);
        Array.Resize(ref _point, capacity);
    }

    /// <summary>
    /// Repulsion on a point at (px, py): Σ_j q_ij² (y_i − y_j) and Σ_j q_ij with q_ij = 1 / (1 + ‖y_i − y_j‖²), the
    /// point itself excluded, cells with (width / distance) &lt; θ taken as one mass at their centre.
    /// <paramref name="stack"/> is per caller so threads can share the tree.
    /// </summary>
    public (double Fx, double Fy, double Z) Repulsion(double px, double py, double theta, ref int[] stack)
    {
        double fx = 0, fy = 0, z = 0, theta2 = theta * theta;
        var nodes = _node;
        int top = 0;
        stack[top++] = 0;
        while (top > 0)
        {
            ref readonly Node node = ref nodes[stack[--top]];
            double dx = px - node.ComX, dy = py - node.ComY, d2 = dx * dx + dy * dy;
            if (node.Child < 0)
            {
                if (d2 == 0) { z += node.Mass - 1; continue; } // the point itself, plus any exact duplicates
            }
            else if (!(node.Width2 < theta2 * d2))
            {
                if (top + 4 > stack.Length) Array.Resize(ref stack, stack.Length * 2);
                for (int c = node.Child; c < node.Child + 4; c++)
                    if (nodes[c].Mass > 0) stack[top++] = c;
                continue;
            }
            double q = 1 / (1 + d2), mq = node.Mass * q;
            z += mq;
            fx += mq * q * dx; fy += mq * q * dy;
        }
        return (fx, fy, z);
    }

    public static int[] NewStack() => new int[256];
}
