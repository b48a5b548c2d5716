using Sweeps.Core.Integrators;
using Sweeps.Core.Models;

namespace Sweeps.Core.Tests.Integrators;

/// <summary>
/// Integrators against exact solutions. Empirical order: halving the step must divide the error by
/// about 2^p (common practice of numerical analysis), on an autonomous system (y' = −y, y = e^−t) and
/// on a time-forced one (y' = cos t − y + sin t, whose solution through y(0) = 0 is sin t: a stage
/// evaluated at the wrong time breaks the order there and only there).
/// </summary>
public sealed class IntegratorTests
{
    private static readonly Model Decay = Maps.Build(ModelKind.Flow, ["y"], [], "-y");
    private static readonly Model Forced = Maps.Build(ModelKind.Flow, ["y"], [], "cos(t) - y + sin(t)");

    [Theory]
    [InlineData(IntegratorMethod.Euler, 1)]
    [InlineData(IntegratorMethod.Rk4, 4)]
    public void FixedStep_ConvergesWithItsOrder_OnAutonomousAndForcedSystems(IntegratorMethod method, int order)
    {
        foreach (var (model, y0, exact) in new[] { (Decay, 1.0, Math.Exp(-2.0)), (Forced, 0.0, Math.Sin(2.0)) })
        {
            var coarse = Math.Abs(Integrate(model, method, 0.02, y0, 2.0) - exact);
            var fine = Math.Abs(Integrate(model, method, 0.01, y0, 2.0) - exact);
            var observed = Math.Log2(coarse / fine);
            Assert.InRange(observed, order - 0.15, order + 0.15);
        }
    }

    [Fact]
    public void DormandPrince_MeetsItsTolerance_OnAutonomousAndForcedSystems()
    {
        foreach (var (model, y0, exact) in new[] { (Decay, 1.0, Math.Exp(-10.0)), (Forced, 0.0, Math.Sin(10.0)) })
        {
            var loose = Math.Abs(Integrate(model, IntegratorMethod.Dopri5, 0.1, y0, 10.0, 1e-6) - exact);
            var tight = Math.Abs(Integrate(model, IntegratorMethod.Dopri5, 0.1, y0, 10.0, 1e-10) - exact);
            Assert.True(loose < 1e-4, $"rtol 1e-6: error {loose}");
            Assert.True(tight < 1e-8, $"rtol 1e-10: error {tight}");
            Assert.True(tight < loose / 100, $"errors {loose} then {tight}");
        }
    }

    /// <summary>The continuous extension is accurate inside a step, not only at its ends.</summary>
    [Theory]
    [InlineData(IntegratorMethod.Dopri5, 1e-7)]
    [InlineData(IntegratorMethod.Rk4, 1e-6)]
    public void Interpolate_MatchesExactSolution_InsideSteps(IntegratorMethod method, double tolerance)
    {
        var system = new OdeSystem(Forced, 0);
        var stepper = Stepper.Create(system, new IntegratorSettings(method, 0.05, 1e-10, 1e-12));
        var y = new[] { 0.0 };
        var t = 0.0;
        var output = new double[1];
        while (t < 3)
        {
            Assert.True(stepper.Advance(y, ref t, 3));
            foreach (var theta in new[] { 0.25, 0.5, 0.75 })
            {
                stepper.Interpolate(theta, output, 1);
                var time = stepper.StartTime + (theta * (stepper.EndTime - stepper.StartTime));
                Assert.True(Math.Abs(output[0] - Math.Sin(time)) < tolerance, $"t = {time}: {output[0]} vs {Math.Sin(time)}");
            }
        }
    }

    [Fact]
    public void Advance_LandsExactlyOnTheLimit()
    {
        var system = new OdeSystem(Decay, 0);
        foreach (var method in Enum.GetValues<IntegratorMethod>())
        {
            var stepper = Stepper.Create(system, new IntegratorSettings(method, 0.03));
            var y = new[] { 1.0 };
            var t = 0.0;
            while (t < 1.0)
            {
                Assert.True(stepper.Advance(y, ref t, 1.0));
            }

            Assert.Equal(1.0, t);
        }
    }

    private static double Integrate(Model model, IntegratorMethod method, double step, double y0, double end, double rtol = 1e-9)
    {
        var stepper = Stepper.Create(new OdeSystem(model, 0), new IntegratorSettings(method, step, rtol, rtol * 1e-3));
        var y = new[] { y0 };
        var t = 0.0;
        while (t < end)
        {
            Assert.True(stepper.Advance(y, ref t, end), stepper.Failure);
        }

        return y[0];
    }
}
