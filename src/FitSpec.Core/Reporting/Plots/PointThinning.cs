namespace FitSpec.Reporting.Plots;

/// <summary>The rows a scatter plot draws, and how many there were.</summary>
internal sealed record ThinnedRows(int[] Indices, int Total, int KeptLargest)
{
    public bool IsThinned => Indices.Length < Total;
}

/// <summary>
/// Keeps large fits' plots small: above <see cref="MaxPoints"/> rows, an even stride through the data plus the
/// rows with the largest |residual| (so the points a reviewer looks for are never dropped). Deterministic:
/// ties go to the earlier row.
/// </summary>
internal static class PointThinning
{
    public const int MaxPoints = 2000;

    /// <summary>How many of the largest |residuals| are always drawn when a plot is thinned.</summary>
    public const int LargestKept = 100;

    public static ThinnedRows Select(IReadOnlyList<double> residuals, int maxPoints = MaxPoints, int largestKept = LargestKept)
    {
        ArgumentNullException.ThrowIfNull(residuals);
        ArgumentOutOfRangeException.ThrowIfLessThan(maxPoints, 1);
        ArgumentOutOfRangeException.ThrowIfNegative(largestKept);
        var n = residuals.Count;
        if (n <= maxPoints)
        {
            return new ThinnedRows([.. Enumerable.Range(0, n)], n, 0);
        }

        var kept = Math.Min(largestKept, maxPoints / 2);
        var keep = new bool[n];
        foreach (var i in Largest(residuals, kept))
        {
            keep[i] = true;
        }

        // The stride fills the rest of the budget; rows already kept for their residual are not counted twice.
        var budget = maxPoints - kept;
        var stride = (double)n / budget;
        for (var j = 0; j < budget; j++)
        {
            keep[(int)(j * stride)] = true;
        }

        var indices = new List<int>(maxPoints);
        for (var i = 0; i < n; i++)
        {
            if (keep[i])
            {
                indices.Add(i);
            }
        }

        return new ThinnedRows([.. indices], n, kept);
    }

    /// <summary>The k rows of largest |residual| (NaN counts as smallest, ties go to the earlier row); a bounded heap, O(n log k).</summary>
    public static IEnumerable<int> Largest(IReadOnlyList<double> residuals, int k)
    {
        if (k == 0)
        {
            return [];
        }

        // The heap's head is the weakest kept row: smallest |e|, and among equals the latest row.
        var heap = new PriorityQueue<int, (double Abs, int NegRow)>(k + 1);
        for (var i = 0; i < residuals.Count; i++)
        {
            var a = Math.Abs(residuals[i]);
            var priority = (double.IsNaN(a) ? -1 : a, -i);
            if (heap.Count < k)
            {
                heap.Enqueue(i, priority);
            }
            else if (heap.TryPeek(out _, out var weakest) && priority.CompareTo(weakest) > 0)
            {
                heap.DequeueEnqueue(i, priority);
            }
        }

        return heap.UnorderedItems.Select(x => x.Element);
    }
}
