using Sweeps.Core.Models;
using Sweeps.Engine.Config;
using Sweeps.Engine.Specs;

namespace Sweeps.Engine.Probing;

/// <summary>Compiles the model of a validated spec.</summary>
public static class ModelFactory
{
    public static Model Build(SweepSpec spec)
    {
        if (Model.TryBuild(spec.Model, out var model, out var errors))
        {
            return model!;
        }

        // The spec reader parsed every equation already, so this means the two disagree: a bug.
        throw new InvalidOperationException(string.Join("; ", errors.Select(e => $"model.equations.{e.Variable}: col {e.Column}: {e.Message}")));
    }
}
