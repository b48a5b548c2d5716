using Sweeps.Core.Models;

namespace Sweeps.Core.Tests;

/// <summary>Builds test models from equation text.</summary>
internal static class Maps
{
    public static Model Build(ModelKind kind, string[] variables, string[] parameters, params string[] equations)
    {
        if (!Model.TryBuild(new ModelSource(kind, variables, parameters, equations), out var model, out var errors))
        {
            throw new InvalidOperationException(string.Join("; ", errors.Select(e => $"{e.Variable}: col {e.Column}: {e.Message}")));
        }

        return model!;
    }

    public static Model Map(string[] variables, string[] parameters, params string[] equations) =>
        Build(ModelKind.Map, variables, parameters, equations);

    public static Model Logistic() => Map(["x"], ["r"], "r*x*(1 - x)");

    public static Model Henon() => Map(["x", "y"], ["a", "b"], "1 - a*x^2 + y", "b*x");

    public static Model Circle() => Map(["theta"], ["omega", "k"], "mod(theta + omega - k/(2*pi)*sin(2*pi*theta), 1)");
}
