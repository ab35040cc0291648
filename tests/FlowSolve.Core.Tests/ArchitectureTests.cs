using System.Reflection;

namespace FlowSolve.Core.Tests;

public sealed class ArchitectureTests
{
    [Fact]
    public void CoreAssembly_ReferencesNothingFromAspNetCoreOrLogging()
    {
        var references = typeof(FlowSolve.Core.Numerics.SafeguardedNewton).Assembly.GetReferencedAssemblies().Select(a => a.Name ?? "").ToArray();
        Assert.DoesNotContain(references, n => n.StartsWith("Microsoft.AspNetCore", StringComparison.Ordinal));
        Assert.DoesNotContain(references, n => n.StartsWith("Microsoft.Extensions", StringComparison.Ordinal));
        Assert.DoesNotContain(references, n => n.StartsWith("Serilog", StringComparison.Ordinal));
    }

    [Fact]
    public void CorePublicTypes_AreSealedStaticOrValueTypes()
    {
        // Immutable results and no inheritance surprises for embedders (style: almost every type sealed or a struct).
        var open = typeof(FlowSolve.Core.Numerics.SafeguardedNewton).Assembly.GetExportedTypes()
            .Where(t => t.IsClass && !t.IsSealed && !t.IsAbstract && !(t.IsAbstract && t.IsSealed))
            .Select(t => t.FullName).ToArray();
        Assert.Empty(open);
    }
}
