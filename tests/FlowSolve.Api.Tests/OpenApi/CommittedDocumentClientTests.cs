using System.Reflection;
using System.Runtime.Loader;
using System.Text.Json.Nodes;
using Microsoft.CodeAnalysis;
using Microsoft.CodeAnalysis.CSharp;
using NSwag;
using NSwag.CodeGeneration.CSharp;
using NSwag.CodeGeneration.OperationNameGenerators;

namespace FlowSolve.Api.Tests.OpenApi;

/// <summary>
/// The committed openapi/flowsolve.v1.json checked by a tool outside the project: NSwag (an independent OpenAPI reader
/// and client generator) must load it, see every operation, and generate a C# client that Roslyn compiles without an
/// error; the compiled client must then call the service and read its answer.
/// </summary>
public sealed class CommittedDocumentClientTests(ApiFixture api)
{
    private static string RepositoryRoot
    {
        get
        {
            var dir = new DirectoryInfo(AppContext.BaseDirectory);
            while (dir is not null && !File.Exists(Path.Combine(dir.FullName, "FlowSolve.sln"))) dir = dir.Parent;
            return dir?.FullName ?? throw new InvalidOperationException("repository root not found");
        }
    }

    private static string DocumentPath => Path.Combine(RepositoryRoot, "openapi", "flowsolve.v1.json");

    private static readonly Lazy<Task<OpenApiDocument>> Document = new(() => OpenApiDocument.FromFileAsync(DocumentPath));

    private static readonly Lazy<Task<(Assembly Assembly, string Code)>> Compiled = new(CompileClient);

    private static async Task<(Assembly, string)> CompileClient()
    {
        var document = await Document.Value;
        var settings = new CSharpClientGeneratorSettings
        {
            ClassName = "FlowSolveGeneratedClient",
            OperationNameGenerator = new SingleClientFromOperationIdOperationNameGenerator(),
            UseBaseUrl = false,
            GenerateClientInterfaces = true,
        };
        settings.CSharpGeneratorSettings.Namespace = "FlowSolve.Generated";
        settings.CSharpGeneratorSettings.JsonLibrary = NJsonSchema.CodeGeneration.CSharp.CSharpJsonLibrary.SystemTextJson;
        string code = new CSharpClientGenerator(document, settings).GenerateFile();

        var references = ((string)AppContext.GetData("TRUSTED_PLATFORM_ASSEMBLIES")!)
            .Split(Path.PathSeparator)
            .Select(path => MetadataReference.CreateFromFile(path));
        var compilation = CSharpCompilation.Create("FlowSolve.Generated",
            [CSharpSyntaxTree.ParseText(code, new CSharpParseOptions(LanguageVersion.Latest))],
            references, new CSharpCompilationOptions(OutputKind.DynamicallyLinkedLibrary, nullableContextOptions: NullableContextOptions.Disable));
        using var image = new MemoryStream();
        var emitted = compilation.Emit(image);
        var errors = emitted.Diagnostics.Where(d => d.Severity == DiagnosticSeverity.Error).Select(d => d.ToString()).ToList();
        if (!emitted.Success)
            throw new InvalidOperationException($"the generated client does not compile ({errors.Count} errors):\n{string.Join("\n", errors.Take(20))}");
        image.Position = 0;
        return (new AssemblyLoadContext("flowsolve-generated-client", isCollectible: true).LoadFromStream(image), code);
    }

    [Fact]
    public async Task FromFile_CommittedDocument_ReadsEveryOperation()
    {
        var document = await Document.Value;
        var raw = JsonNode.Parse(await File.ReadAllTextAsync(DocumentPath, TestContext.Current.CancellationToken))!;
        string[] methods = ["get", "put", "post", "delete", "patch", "head", "options", "trace"];
        var expected = raw["paths"]!.AsObject()
            .SelectMany(p => p.Value!.AsObject().Where(o => methods.Contains(o.Key)).Select(o => $"{o.Key.ToUpperInvariant()} {p.Key}"))
            .Order().ToList();
        var read = document.Operations.Select(o => $"{o.Method.ToUpperInvariant()} {o.Path}").Order().ToList();

        Assert.StartsWith("3.0.", raw["openapi"]!.GetValue<string>());
        Assert.NotEmpty(expected);
        Assert.Equal(expected, read);
        Assert.All(document.Operations, o => Assert.False(string.IsNullOrWhiteSpace(o.Operation.OperationId), $"{o.Method} {o.Path} has no operationId"));
        Assert.Equal(document.Operations.Count(), document.Operations.Select(o => o.Operation.OperationId).Distinct().Count());
    }

    [Fact]
    public async Task GenerateClient_CommittedDocument_CompilesWithAMethodPerOperation()
    {
        var (assembly, code) = await Compiled.Value;
        var document = await Document.Value;
        var client = assembly.GetType("FlowSolve.Generated.FlowSolveGeneratedClient");
        Assert.NotNull(client);
        var names = client.GetMethods().Select(m => m.Name).ToHashSet();
        foreach (var operation in document.Operations)
        {
            string method = char.ToUpperInvariant(operation.Operation.OperationId[0]) + operation.Operation.OperationId[1..] + "Async";
            Assert.True(names.Contains(method), $"generated client has no {method} for {operation.Method} {operation.Path}");
        }
        Assert.Contains("class FlowSolveGeneratedClient", code);
    }

    [Fact]
    public async Task GeneratedClient_GetFrictionFactor_ReadsTheServiceAnswer()
    {
        var (assembly, _) = await Compiled.Value;
        var type = assembly.GetType("FlowSolve.Generated.FlowSolveGeneratedClient")!;
        var client = Activator.CreateInstance(type, api.Client)!;
        var method = type.GetMethods().Single(m => m.Name == "GetFrictionFactorAsync"
                                                  && m.GetParameters().All(p => p.ParameterType != typeof(CancellationToken)));
        var arguments = method.GetParameters().Select(p => p.Name switch
        {
            "reynolds" => (object?)75000.0,
            "relativeRoughness" => 0.005,
            _ => p.HasDefaultValue ? p.DefaultValue : null,
        }).ToArray();

        var task = (Task)method.Invoke(client, arguments)!;
        await task;
        object response = task.GetType().GetProperty("Result")!.GetValue(task)!;
        double f = Convert.ToDouble(response.GetType().GetProperty("FrictionFactor")!.GetValue(response), System.Globalization.CultureInfo.InvariantCulture);

        // Reference: F. M. White, Fluid Mechanics, Moody-type table at e/D = 0.005: Re 75 000 -> f = 0.0316 (three
        // significant figures, so half a unit in the third figure), the same check as deploy/container-smoke.sh.
        Assert.Equal(0.0316, f, 0.00005);
    }
}
