using Sweeps.Core.Analysis;
using Sweeps.Core.Integrators;
using Sweeps.Core.Models;

namespace Sweeps.Core.Tests.Integrators;

/// <summary>
/// The generated flow code (fused augmented derivative, whole Euler and RK4 steps) against the plain
/// reference loops it replaces: the same operations in the same order, so every value must agree bit for
/// bit (an exact zero may differ in sign, which compares equal). Models cover a constant Jacobian entry,
/// identically zero entries, a cube, a transcendental function and explicit time (a forced system, where a
/// stage evaluated at the wrong time would show), and functions of the parameters and time alone that appear in
/// several equations and Jacobian entries (computed once per step and per stage time in the generated code).
/// </summary>
public sealed class FlowKernelTests
{
    public static TheoryData<string, double[]> Flows => new()
    {
        { "lorenz", [10, 28, 8.0 / 3] },
        { "forced", [0.3, 1.2, 1.1] },
        { "pendulum", [0.25] },
        { "pumped", [0.2, 1.7, 0.9, 0.4] },
    };

    [Theory]
    [MemberData(nameof(Flows))]
    public void FusedDerivative_EqualsReferenceLoop_ForEveryTangentCount(string name, double[] parameters)
    {
        var model = Build(name);
        var random = new Random(7);
        for (var vectors = 0; vectors <= model.Dimension; vectors++)
        {
            var generated = new OdeSystem(model, vectors) { Parameters = parameters };
            var reference = new OdeSystem(model, vectors, generated: false) { Parameters = parameters };
            for (var trial = 0; trial < 50; trial++)
            {
                var y = Enumerable.Range(0, generated.Dimension).Select(_ => (random.NextDouble() * 4) - 2).ToArray();
                var t = random.NextDouble() * 10;
                var (fast, plain) = (new double[y.Length], new double[y.Length]);
                generated.Derivative(t, y, fast);
                reference.Derivative(t, y, plain);
                Assert.Equal(plain, fast);
            }
        }
    }

    [Theory]
    [MemberData(nameof(Flows))]
    public void GeneratedSteps_EqualReferenceSteps_AlongAnOrbit(string name, double[] parameters)
    {
        var model = Build(name);
        foreach (var method in new[] { IntegratorMethod.Euler, IntegratorMethod.Rk4 })
        {
            var settings = new IntegratorSettings(method, 0.01);
            var generated = Stepper.Create(new OdeSystem(model, model.Dimension) { Parameters = parameters }, settings);
            var reference = Stepper.Create(new OdeSystem(model, model.Dimension, generated: false) { Parameters = parameters }, settings);
            var y = Start(model);
            var z = (double[])y.Clone();
            var (t, s) = (0.0, 0.0);
            var (fast, plain) = (new double[y.Length], new double[y.Length]);
            for (var step = 0; step < 2000; step++)
            {
                Assert.True(generated.Advance(y, ref t, 100));
                Assert.True(reference.Advance(z, ref s, 100));
                generated.Interpolate(0.3, fast, y.Length);
                reference.Interpolate(0.3, plain, z.Length);
                Assert.Equal(plain, fast);
            }

            Assert.Equal(s, t);
            Assert.Equal(z, y);
        }
    }

    /// <summary>Dormand–Prince with error control: accepted steps, rejections and the step size all follow the same bits.</summary>
    [Theory]
    [MemberData(nameof(Flows))]
    public void GeneratedDormandPrince_EqualsReferenceStages_AlongAnOrbit(string name, double[] parameters)
    {
        var model = Build(name);
        var settings = new IntegratorSettings(IntegratorMethod.Dopri5, 0.05, 1e-9, 1e-12);
        var generated = (DormandPrinceStepper)Stepper.Create(new OdeSystem(model, model.Dimension) { Parameters = parameters }, settings);
        var reference = (DormandPrinceStepper)Stepper.Create(new OdeSystem(model, model.Dimension, generated: false) { Parameters = parameters }, settings);
        var y = Start(model);
        var z = (double[])y.Clone();
        var (t, s) = (0.0, 0.0);
        var (fast, plain) = (new double[y.Length], new double[y.Length]);
        while (t < 20)
        {
            Assert.True(generated.Advance(y, ref t, 20));
            Assert.True(reference.Advance(z, ref s, 20));
            Assert.Equal(s, t);
            Assert.Equal(z, y);
            generated.Interpolate(0.6, fast, y.Length);
            reference.Interpolate(0.6, plain, z.Length);
            Assert.Equal(plain, fast);
        }

        Assert.Equal(reference.Accepted, generated.Accepted);
        Assert.Equal(reference.Rejected, generated.Rejected);
    }

    /// <summary>Whole points through the analyzer: exponents, period and regime as the reference path gives them.</summary>
    [Fact]
    public void FlowAnalyzer_GivesReferenceResults_WithGeneratedSteps()
    {
        var model = Build("lorenz");
        var settings = new AnalysisSettings(Transient: 10, Measure: 40, Tolerance: 1e-6, ZeroBand: 5e-3);
        foreach (var rho in new[] { 10.0, 28.0, 160.0 })
        {
            var fast = new FlowAnalyzer(model, settings, new IntegratorSettings(IntegratorMethod.Rk4, 0.01), new SectionSettings()).Analyze([1, 1, 1], [10, rho, 8.0 / 3]);
            var plain = FlowAnalyzer.Reference(model, settings, new IntegratorSettings(IntegratorMethod.Rk4, 0.01), new SectionSettings()).Analyze([1, 1, 1], [10, rho, 8.0 / 3]);
            Assert.Equal(plain.Regime, fast.Regime);
            Assert.Equal(plain.Period, fast.Period);
            Assert.Equal(plain.Lyapunov, fast.Lyapunov);
            Assert.Equal(plain.FinalState, fast.FinalState);
        }
    }

    private static double[] Start(Model model) => model.Dimension switch
    {
        3 => [1, 1, 1, 1, 0, 0, 0, 1, 0, 0, 0, 1],
        _ => [0.5, 0.1, 1, 0, 0, 1],
    };

    private static Model Build(string name) => name switch
    {
        "lorenz" => Maps.Build(ModelKind.Flow, ["x", "y", "z"], ["sigma", "rho", "beta"], "sigma*(y - x)", "x*(rho - z) - y", "x*y - beta*z"),
        "forced" => Maps.Build(ModelKind.Flow, ["x", "v"], ["delta", "w", "gamma"], "v", "-delta*v - x - x^3 + gamma*cos(w*t)"),
        "pumped" => Maps.Build(
            ModelKind.Flow,
            ["x", "v"],
            ["delta", "k", "w", "gamma"],
            "v + k^1.5*cos(w*t)",
            "-delta*v - sqrt(k)*(1 + gamma*cos(w*t))*x - x^3 + exp(-k)*cos(w*t)"),
        _ => Maps.Build(ModelKind.Flow, ["q", "w"], ["damping"], "w", "-damping*w - sin(q)"),
    };
}
