using FlowSolve.Api.Contracts;
using FlowSolve.Api.Hosting;

namespace FlowSolve.Api.Tests.Batch;

/// <summary>The guard every batch row's answer passes (<see cref="CalculationGuard.Finite"/>) names the first number that
/// is not finite by its path in the answer, list items included: the item's index in a list of one type, of mixed types,
/// and in a sequence that is not a list, and the key of a dictionary entry.</summary>
public class FiniteAnswerGuardTests
{
    public sealed record Point(double X, double? Y);

    public sealed record Other(double Z);

    public sealed record Answer(double Flow, IReadOnlyList<ValidityDto> Validity, IReadOnlyList<object> Mixed,
        IEnumerable<Point> Points, IReadOnlyDictionary<string, Point>? Table);

    private static ValidityDto Check(double value) => new("colebrook-white", "reynolds", 4000, 1e8, value, true, "source");

    private static Answer Clean() => new(0.2, [Check(1e5), Check(2e5)], [new Point(1, 2), new Other(3)],
        Queued(-1), new Dictionary<string, Point> { ["a"] = new(1, 1) });

    [Fact]
    public void FirstNonFinite_AllFinite_Null() => Assert.Null(CalculationGuard.Finite.FirstNonFinite(Clean()));

    [Theory]
    [InlineData(double.NaN)]
    [InlineData(double.PositiveInfinity)]
    [InlineData(double.NegativeInfinity)]
    public void FirstNonFinite_InTheSecondItemOfAList_NamesItsIndex(double bad) =>
        Assert.Equal("validity[1].value", CalculationGuard.Finite.FirstNonFinite(Clean() with { Validity = [Check(1e5), Check(bad)] }));

    [Fact]
    public void FirstNonFinite_ItemsOfMixedTypes_EachCheckedAsItsOwnType() =>
        Assert.Equal("mixed[2].z", CalculationGuard.Finite.FirstNonFinite(Clean() with { Mixed = [new Point(1, 2), new Other(3), new Other(double.NaN)] }));

    [Fact]
    public void FirstNonFinite_NullItemsAreSkipped() =>
        Assert.Equal("mixed[2].y", CalculationGuard.Finite.FirstNonFinite(Clean() with { Mixed = [new Point(1, 2), null!, new Point(1, double.NaN)] }));

    [Fact]
    public void FirstNonFinite_ASequenceThatIsNotAList_NamesTheItemsPosition() =>
        Assert.Equal("points[2].x", CalculationGuard.Finite.FirstNonFinite(Clean() with { Points = Queued(2) }));

    [Fact]
    public void FirstNonFinite_ACompilerMadeIterator_IsWalkedByItsItemType()
    {
        // A sequence whose runtime type is not generic (the class the compiler makes for an iterator method) is walked as
        // the IEnumerable<Point> it implements, not skipped as a type without numbers.
        var sequence = Yielded(1);
        Assert.False(sequence.GetType().IsGenericType);
        Assert.Equal("points[1].x", CalculationGuard.Finite.FirstNonFinite(Clean() with { Points = sequence }));
        Assert.Null(CalculationGuard.Finite.FirstNonFinite(Clean() with { Points = Yielded(-1) }));
    }

    private static IEnumerable<Point> Yielded(int bad)
    {
        for (int i = 0; i < 3; i++) yield return new Point(i == bad ? double.NaN : i, null);
    }

    /// <summary>Three points in a queue (a sequence that is not a list), the one at <paramref name="bad"/> not finite.</summary>
    private static Queue<Point> Queued(int bad) => new(Enumerable.Range(0, 3).Select(i => new Point(i == bad ? double.NaN : i, null)));

    [Fact]
    public void FirstNonFinite_ADictionaryEntry_NamesItsKey() =>
        Assert.Equal("table.b.y", CalculationGuard.Finite.FirstNonFinite(Clean() with
        {
            Table = new Dictionary<string, Point> { ["a"] = new(1, 1), ["b"] = new(1, double.NaN) },
        }));
}
