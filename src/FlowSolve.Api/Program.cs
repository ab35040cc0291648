using FlowSolve.Api.Channels;
using FlowSolve.Api.Fluids;
using FlowSolve.Api.Friction;
using FlowSolve.Api.Hosting;
using Serilog;

// Two-stage Serilog start: a bootstrap logger until the host is built, so start-up failures are logged too.
Log.Logger = new LoggerConfiguration().WriteTo.Console().CreateBootstrapLogger();
try
{
    var builder = WebApplication.CreateBuilder(args);
    builder.Services.AddSerilog((services, logger) => Logging.Configure(builder.Configuration, logger));
    builder.Services.AddFlowSolveServices();

    var app = builder.Build();
    app.UseFlowSolvePipeline();
    app.MapFrictionEndpoints();
    app.MapFluidEndpoints();
    app.MapChannelEndpoints();
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
