namespace FlowSolve.Core.Networks;

/// <summary>Checks of a compressed-row pattern shared by the network's sparse solvers.</summary>
internal static class SparsePattern
{
    /// <summary>Validates a symmetric pattern (row pointers from 0 to the column count; in each row, columns sorted,
    /// distinct, in range and including the diagonal) and returns each row's diagonal position.</summary>
    /// <exception cref="ArgumentException">The pattern is malformed.</exception>
    public static int[] Diagonals(int[] rowStart, int[] columns)
    {
        ArgumentNullException.ThrowIfNull(rowStart);
        ArgumentNullException.ThrowIfNull(columns);
        int n = rowStart.Length - 1;
        if (n < 0 || rowStart[0] != 0 || rowStart[n] != columns.Length)
            throw new ArgumentException("rowStart must run from 0 to columns.Length", nameof(rowStart));
        var diagonal = new int[n];
        for (int i = 0; i < n; i++)
        {
            diagonal[i] = -1;
            for (int k = rowStart[i]; k < rowStart[i + 1]; k++)
            {
                if (k > rowStart[i] && columns[k] <= columns[k - 1])
                    throw new ArgumentException($"row {i}: columns must be sorted and distinct", nameof(columns));
                if ((uint)columns[k] >= (uint)n) throw new ArgumentException($"row {i}: column out of range", nameof(columns));
                if (columns[k] == i) diagonal[i] = k;
            }
            if (diagonal[i] < 0) throw new ArgumentException($"row {i} has no diagonal entry", nameof(columns));
        }
        return diagonal;
    }

    /// <summary>y = A x for a compressed-row matrix; allocation-free.</summary>
    public static void Multiply(int[] rowStart, int[] columns, double[] values, ReadOnlySpan<double> x, Span<double> y)
    {
        for (int i = 0; i < y.Length; i++)
        {
            double s = 0;
            for (int k = rowStart[i]; k < rowStart[i + 1]; k++) s += values[k] * x[columns[k]];
            y[i] = s;
        }
    }
}
