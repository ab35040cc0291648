using System.Text.RegularExpressions;
using Microsoft.AspNetCore.Http;
using Serilog.Events;
using YamlDotNet.RepresentationModel;

namespace FlowSolve.Api.Tests.Deploy;

/// <summary>
/// Checks that deploy/Dockerfile and the manifests in deploy/kubernetes agree with each other and with the service:
/// one port everywhere, probes on paths the service answers, selectors that select the pods, a hardened pod; and that
/// the offline image build (deploy/build-image.sh), the container smoke test (deploy/container-smoke.sh) and
/// docs/container.md agree with them. The image itself is built and run by the smoke test in CI.
/// </summary>
public sealed class ManifestTests(ApiFixture api)
{
    private static readonly string Root = FindRoot();
    private static readonly string KubernetesDir = Path.Combine(Root, "deploy", "kubernetes");

    private static string FindRoot()
    {
        var dir = new DirectoryInfo(AppContext.BaseDirectory);
        while (dir is not null && !File.Exists(Path.Combine(dir.FullName, "FlowSolve.sln"))) dir = dir.Parent;
        return dir?.FullName ?? throw new InvalidOperationException("repository root not found");
    }

    private static YamlMappingNode Manifest(string file)
    {
        var stream = new YamlStream();
        using (var reader = new StreamReader(Path.Combine(KubernetesDir, file))) stream.Load(reader);
        Assert.Single(stream.Documents);
        return Assert.IsType<YamlMappingNode>(stream.Documents[0].RootNode);
    }

    private static YamlMappingNode Deployment => Manifest("deployment.yaml");

    private static YamlMappingNode Container
    {
        get
        {
            var containers = Seq(Map(Map(Map(Deployment, "spec"), "template"), "spec"), "containers");
            return Assert.IsType<YamlMappingNode>(Assert.Single(containers.Children));
        }
    }

    private static YamlMappingNode Map(YamlMappingNode node, string key) =>
        Assert.IsType<YamlMappingNode>(node.Children[new YamlScalarNode(key)]);

    private static YamlSequenceNode Seq(YamlMappingNode node, string key) =>
        Assert.IsType<YamlSequenceNode>(node.Children[new YamlScalarNode(key)]);

    private static string Scalar(YamlMappingNode node, string key) =>
        Assert.IsType<YamlScalarNode>(node.Children[new YamlScalarNode(key)]).Value!;

    private static Dictionary<string, string> Labels(YamlMappingNode node) =>
        node.Children.ToDictionary(kv => ((YamlScalarNode)kv.Key).Value!, kv => ((YamlScalarNode)kv.Value).Value!);

    private static Dictionary<string, string> PodLabels => Labels(Map(Map(Map(Map(Deployment, "spec"), "template"), "metadata"), "labels"));

    /// <summary>The named container port, from the Deployment.</summary>
    private static (string Name, int Port) ContainerPort
    {
        get
        {
            var port = Assert.IsType<YamlMappingNode>(Assert.Single(Seq(Container, "ports").Children));
            return (Scalar(port, "name"), int.Parse(Scalar(port, "containerPort"), System.Globalization.CultureInfo.InvariantCulture));
        }
    }

    /// <summary>The lines of the Dockerfile's last (runtime) stage.</summary>
    private static string[] RuntimeStage()
    {
        var lines = File.ReadAllLines(Path.Combine(Root, "deploy", "Dockerfile"));
        int from = Array.FindLastIndex(lines, l => l.StartsWith("FROM ", StringComparison.Ordinal));
        Assert.True(from >= 0, "the Dockerfile has no FROM line");
        return lines[from..];
    }

    /// <summary>The value of an <c>ENV KEY=VALUE</c> line in the runtime stage.</summary>
    private static string DockerEnv(string key)
    {
        var line = Assert.Single(RuntimeStage(), l => l.StartsWith($"ENV {key}=", StringComparison.Ordinal));
        return line[$"ENV {key}=".Length..].Trim().Trim('"');
    }

    private static string DeployFile(string name) => File.ReadAllText(Path.Combine(Root, "deploy", name));

    private static int Int(string text) => int.Parse(text, System.Globalization.CultureInfo.InvariantCulture);

    /// <summary>The port of a Kestrel address such as <c>http://+:8080</c>, parsed as Kestrel parses it.</summary>
    private static int UrlPort(string url) => BindingAddress.Parse(url).Port;

    [Fact]
    public void ContainerPort_EqualsDockerfileExposeAndUrls()
    {
        var expose = Assert.Single(RuntimeStage(), l => l.StartsWith("EXPOSE ", StringComparison.Ordinal));
        var match = Regex.Match(expose, @"^EXPOSE (\d+)(/tcp)?\s*$");
        Assert.True(match.Success, $"unexpected EXPOSE line: {expose}");
        int exposed = int.Parse(match.Groups[1].Value, System.Globalization.CultureInfo.InvariantCulture);

        Assert.Equal(exposed, ContainerPort.Port);
        Assert.Equal(exposed, UrlPort(DockerEnv("Urls")));
    }

    [Fact]
    public void DockerfileUrls_BindsEveryInterface()
    {
        // A loopback-only listener inside a container cannot be reached through a port mapping or a Service.
        string host = BindingAddress.Parse(DockerEnv("Urls")).Host;
        Assert.Contains(host, new[] { "+", "*", "0.0.0.0", "[::]" });
    }

    [Fact]
    public void DeploymentUrls_AgreesWithContainerPortAndBindsEveryInterface()
    {
        var env = Seq(Container, "env").Children.Cast<YamlMappingNode>().ToDictionary(e => Scalar(e, "name"), e => Scalar(e, "value"));
        // Urls, not ASPNETCORE_URLS: appsettings.json's Urls outranks the ASPNETCORE_ variables (see deploy/Dockerfile).
        Assert.DoesNotContain("ASPNETCORE_URLS", env.Keys);
        Assert.True(env.TryGetValue("Urls", out var urls), "the container sets no Urls variable");
        Assert.Equal(ContainerPort.Port, UrlPort(urls));
        Assert.Equal(BindingAddress.Parse(DockerEnv("Urls")).Host, BindingAddress.Parse(urls).Host);
    }

    [Theory]
    [InlineData("livenessProbe", "/health/live")]
    [InlineData("readinessProbe", "/health/ready")]
    [InlineData("startupProbe", "/health/ready")] // the path docs/operations.md names for start-up
    public async Task Probe_UsesHealthPathOnNamedPort_AndThePathAnswers200(string probe, string expectedPath)
    {
        var get = Map(Map(Container, probe), "httpGet");
        string path = Scalar(get, "path");
        Assert.Equal(expectedPath, path);
        Assert.Equal(ContainerPort.Name, Scalar(get, "port"));

        using var response = await api.Client.GetAsync(path, TestContext.Current.CancellationToken);
        Assert.Equal(200, (int)response.StatusCode);
        Assert.Equal("Healthy", await response.Content.ReadAsStringAsync(TestContext.Current.CancellationToken));
    }

    [Fact]
    public void Service_TargetsNamedContainerPort_AndSelectsThePods()
    {
        var spec = Map(Manifest("service.yaml"), "spec");
        Assert.Equal("ClusterIP", Scalar(spec, "type"));
        var port = Assert.IsType<YamlMappingNode>(Assert.Single(Seq(spec, "ports").Children));
        Assert.Equal("80", Scalar(port, "port"));
        Assert.Equal(ContainerPort.Name, Scalar(port, "targetPort"));
        AssertSelects(Labels(Map(spec, "selector")), PodLabels);
    }

    [Fact]
    public void Deployment_SelectorMatchesItsPodLabels()
    {
        AssertSelects(Labels(Map(Map(Map(Deployment, "spec"), "selector"), "matchLabels")), PodLabels);
    }

    [Fact]
    public void Hpa_TargetsTheDeployment()
    {
        var hpa = Manifest("hpa.yaml");
        Assert.Equal("autoscaling/v2", Scalar(hpa, "apiVersion"));
        var target = Map(Map(hpa, "spec"), "scaleTargetRef");
        Assert.Equal("Deployment", Scalar(target, "kind"));
        Assert.Equal(Scalar(Deployment, "apiVersion"), Scalar(target, "apiVersion"));
        Assert.Equal(Scalar(Map(Deployment, "metadata"), "name"), Scalar(target, "name"));

        // The autoscaler's floor must not undercut the Deployment's starting count, nor the PDB's minimum.
        var spec = Map(hpa, "spec");
        int min = int.Parse(Scalar(spec, "minReplicas"), System.Globalization.CultureInfo.InvariantCulture);
        Assert.Equal(int.Parse(Scalar(Map(Deployment, "spec"), "replicas"), System.Globalization.CultureInfo.InvariantCulture), min);
        Assert.True(min > int.Parse(Scalar(Map(Manifest("pdb.yaml"), "spec"), "minAvailable"), System.Globalization.CultureInfo.InvariantCulture),
            "with minReplicas no greater than the PDB's minAvailable, no pod could ever be evicted voluntarily");
    }

    [Fact]
    public void Pdb_SelectorMatchesPodLabels()
    {
        AssertSelects(Labels(Map(Map(Map(Manifest("pdb.yaml"), "spec"), "selector"), "matchLabels")), PodLabels);
    }

    [Fact]
    public void SecurityContext_NonRootReadOnlyNoEscalationNoCapabilities()
    {
        var container = Map(Container, "securityContext");
        Assert.Equal("true", Scalar(container, "runAsNonRoot"));
        Assert.Equal("true", Scalar(container, "readOnlyRootFilesystem"));
        Assert.Equal("false", Scalar(container, "allowPrivilegeEscalation"));
        var drop = Seq(Map(container, "capabilities"), "drop").Children.Cast<YamlScalarNode>().Select(s => s.Value);
        Assert.Equal(["ALL"], drop);

        var pod = Map(Map(Map(Map(Deployment, "spec"), "template"), "spec"), "securityContext");
        Assert.Equal("true", Scalar(pod, "runAsNonRoot"));
        Assert.NotEqual("0", Scalar(pod, "runAsUser"));
        // The image must name a user too, or runAsNonRoot has nothing to check against.
        Assert.Single(RuntimeStage(), l => l.StartsWith("USER ", StringComparison.Ordinal) && l.Trim() != "USER root" && l.Trim() != "USER 0");
    }

    [Fact]
    public void Tmp_IsTheOnlyWritableMount_AnEmptyDir()
    {
        var mount = Assert.IsType<YamlMappingNode>(Assert.Single(Seq(Container, "volumeMounts").Children));
        Assert.Equal("/tmp", Scalar(mount, "mountPath"));
        var volumes = Seq(Map(Map(Map(Deployment, "spec"), "template"), "spec"), "volumes").Children.Cast<YamlMappingNode>();
        var volume = Assert.Single(volumes, v => Scalar(v, "name") == Scalar(mount, "name"));
        Assert.True(volume.Children.ContainsKey(new YamlScalarNode("emptyDir")), "/tmp is not an emptyDir");
    }

    [Fact]
    public void ConfigMap_IsReadByTheContainer_AndHoldsValidLoggingSettings()
    {
        var configMap = Manifest("configmap.yaml");
        string name = Scalar(Map(configMap, "metadata"), "name");
        var refs = Seq(Container, "envFrom").Children.Cast<YamlMappingNode>()
            .Where(e => e.Children.ContainsKey(new YamlScalarNode("configMapRef")))
            .Select(e => Scalar(Map(e, "configMapRef"), "name"));
        Assert.Contains(name, refs);

        var data = Labels(Map(configMap, "data"));
        Assert.Equal("json", data["FlowSolve__Logging__Format"]);
        // The service parses the level as a Serilog LogEventLevel (Hosting/Logging.cs).
        Assert.True(Enum.TryParse<LogEventLevel>(data["FlowSolve__Logging__Level"], out var level));
        Assert.Equal(LogEventLevel.Information, level);
    }

    [Fact]
    public void Kustomization_ListsEveryManifest()
    {
        var listed = Seq(Manifest("kustomization.yaml"), "resources").Children.Cast<YamlScalarNode>().Select(s => s.Value!).Order();
        var files = Directory.GetFiles(KubernetesDir, "*.yaml").Select(Path.GetFileName).Where(f => f != "kustomization.yaml").Order();
        Assert.Equal(files, listed);
    }

    [Fact]
    public void Dockerfile_BaseImagesAreBuildArguments_DefaultingToTheOfficialImagesOfTheTargetFramework()
    {
        var lines = File.ReadAllLines(Path.Combine(Root, "deploy", "Dockerfile"));
        int firstFrom = Array.FindIndex(lines, l => l.StartsWith("FROM ", StringComparison.Ordinal));
        var args = lines[..firstFrom].Where(l => l.StartsWith("ARG ", StringComparison.Ordinal))
            .Select(l => l["ARG ".Length..].Split('=', 2)).ToDictionary(a => a[0], a => a[1]);
        var froms = lines.Where(l => l.StartsWith("FROM ", StringComparison.Ordinal)).ToArray();
        Assert.Equal(2, froms.Length);
        Assert.Matches(@"^FROM (--platform=\$BUILDPLATFORM )?\$\{SDK_IMAGE\} AS build$", froms[0]);
        Assert.Matches(@"^FROM \$\{RUNTIME_IMAGE\} AS runtime$", froms[1]);

        // The production defaults: the official images of the .NET version the projects target.
        string target = Regex.Match(File.ReadAllText(Path.Combine(Root, "Directory.Build.props")), @"<TargetFramework>net(\d+\.\d+)</TargetFramework>").Groups[1].Value;
        Assert.NotEmpty(target);
        Assert.Equal($"mcr.microsoft.com/dotnet/sdk:{target}", args["SDK_IMAGE"]);
        Assert.StartsWith($"mcr.microsoft.com/dotnet/aspnet:{target}-", args["RUNTIME_IMAGE"]);
    }

    [Fact]
    public void LocalRuntimeBase_DefinesTheUserTheDeploymentRunsAs()
    {
        // The Dockerfile's USER $APP_UID takes the number from the runtime base image: the official images set 1654;
        // deploy/build-image.sh's own runtime base must set the same, with that user in /etc/passwd and /etc/group.
        string script = DeployFile("build-image.sh");
        var pod = Map(Map(Map(Map(Deployment, "spec"), "template"), "spec"), "securityContext");
        string uid = Scalar(pod, "runAsUser"), gid = Scalar(pod, "runAsGroup");
        Assert.Equal(uid, Regex.Match(script, @"""ENV APP_UID=(\d+)""").Groups[1].Value);
        Assert.Matches($@"app:x:{uid}:{gid}:", script);
        Assert.Matches($@"app:x:{gid}:", script);
        Assert.Single(RuntimeStage(), l => l.Trim() == "USER $APP_UID");
    }

    [Fact]
    public void SmokeTestGracePeriod_EqualsTheDeploymentsTerminationGracePeriod()
    {
        var podSpec = Map(Map(Map(Deployment, "spec"), "template"), "spec");
        var grace = Regex.Match(DeployFile("container-smoke.sh"), @"^grace=(\d+)$", RegexOptions.Multiline);
        Assert.True(grace.Success, "container-smoke.sh sets no grace period");
        Assert.Equal(Int(Scalar(podSpec, "terminationGracePeriodSeconds")), Int(grace.Groups[1].Value));
    }

    [Fact]
    public void ContainerDoc_RunLineIsTheSmokeTestsOwn()
    {
        // The smoke test's run=(...) array, without the words it fills in at run time (names, key, grace period).
        string script = DeployFile("container-smoke.sh");
        var array = Regex.Match(script, @"^run=\((podman run .*?)\)$", RegexOptions.Multiline | RegexOptions.Singleline);
        Assert.True(array.Success, "container-smoke.sh has no run=(podman run ...) array");
        var smoke = array.Groups[1].Value.Split((char[])[' ', '\n'], StringSplitOptions.RemoveEmptyEntries).ToArray();
        var fixedWords = smoke.Where(w => !w.Contains('$')).ToArray();

        // The documented podman command: the first code line that starts with "podman run", with its continuations.
        var doc = File.ReadAllLines(Path.Combine(Root, "docs", "container.md"));
        int start = Array.FindIndex(doc, l => l.StartsWith("podman run ", StringComparison.Ordinal));
        Assert.True(start >= 0, "docs/container.md shows no podman run command");
        var command = new List<string>();
        for (int i = start; i < doc.Length; i++)
        {
            command.Add(doc[i].TrimEnd('\\', ' '));
            if (!doc[i].TrimEnd().EndsWith('\\')) break;
        }
        var documented = string.Join(' ', command).Split(' ', StringSplitOptions.RemoveEmptyEntries);

        foreach (string word in fixedWords) Assert.Contains(word, documented);
        // Every option in the documented line is one the smoke test passes, and the other way round.
        Assert.Equal(smoke.Where(w => w.StartsWith('-')).Select(w => w.Split('=')[0]).Order(),
            documented.Where(w => w.StartsWith('-')).Select(w => w.Split('=')[0]).Order());
    }

    /// <summary>A selector selects a pod when every one of its labels is on the pod with the same value.</summary>
    private static void AssertSelects(Dictionary<string, string> selector, Dictionary<string, string> podLabels)
    {
        Assert.NotEmpty(selector);
        foreach (var (key, value) in selector)
        {
            Assert.True(podLabels.TryGetValue(key, out var actual), $"pod template has no label {key}");
            Assert.Equal(value, actual);
        }
    }
}
