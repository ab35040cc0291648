using FlowSolve.Api.Batch;
using FlowSolve.Api.Check;
using FlowSolve.Api;
using FlowSolve.Api.Hosting;
using FlowSolve.Api.Pipes;
using Serilog;

// Two-stage Serilog start: a console logger until the configuration is read, so start-up failures are logged too.
Log.Logger = new LoggerConfiguration().WriteTo.Console().CreateLogger();
try
{
    var builder = WebApplication.CreateBuilder(args);
    // The configured logger replaces the bootstrap one; built here rather than through the reloadable bootstrap logger,
    // which can be frozen only once per process (several hosts run in one test process).
    var logger = new LoggerConfiguration();
    Logging.Configure(builder.Configuration, logger);
    Log.Logger = logger.CreateLogger();
    builder.Services.AddSerilog();
    builder.Services.AddFlowSolveServices(builder.Configuration);

    var app = builder.Build();
    app.UseFlowSolvePipeline();
    app.MapCatalogue();
    app.MapBatchEndpoints(); // after the catalogue: its description lists the row calculations
    app.MapPipeEndpoints();
    app.MapCheckEndpoints(); // after every calculation: it registers a check for each
    app.Run();
}
catch (Exception ex) when (ex is not HostAbortedException)
{
    Log.Fatal(ex, "FlowSolve stopped during start-up");
    throw;
}
finally
{
    Log.CloseAndFlush();
}
