using CsCheck;
using Sweeps.Core.Analysis;
using Sweeps.Core.Integrators;
using Sweeps.Core.Models;

namespace Sweeps.Core.Tests.Analysis;

public sealed class FlowAnalyzerTests
{
    private static readonly IntegratorSettings Precise = new(IntegratorMethod.Dopri5, 0.01, 1e-10, 1e-12);

    private static Model Flow(string[] variables, string[] parameters, params string[] equations) =>
        Maps.Build(ModelKind.Flow, variables, parameters, equations);

    private static Model Lorenz() => Flow(["x", "y", "z"], ["sigma", "rho", "beta"], "sigma*(y - x)", "x*(rho - z) - y", "x*y - beta*z");

    private static PointResult Analyze(Model model, double[] x0, double[] p, AnalysisSettings settings, IntegratorSettings? integrator = null) =>
        new FlowAnalyzer(model, settings, integrator ?? Precise, new SectionSettings()).Analyze(x0, p);

    // Spectrum 0.9056, 0, −14.5723 at σ = 10, ρ = 28, β = 8/3: J. C. Sprott, "Common Chaotic Systems"
    // and "Lyapunov exponent of the Lorenz attractor"; E. N. Lorenz, J. Atmos. Sci. 20 (1963) 130–141.
    // Exact: ∇·f = −(σ + 1 + β), so the exponents sum to −13.666667.
    [Fact]
    public void Analyze_MatchesPublishedLorenzSpectrum_AndItsExactSum()
    {
        var settings = new AnalysisSettings(Transient: 50, Measure: 10_000, Tolerance: 1e-6, ZeroBand: 0.01);
        var result = Analyze(Lorenz(), [1, 1, 1], [10, 28, 8.0 / 3], settings, new IntegratorSettings(IntegratorMethod.Rk4, 0.005));
        Assert.Equal(Regime.Chaotic, result.Regime);
        Tolerance.Close(0.9056, result.Lyapunov[0], Tolerance.PublishedFlowExponent, "λ1");
        Tolerance.Close(0.0, result.Lyapunov[1], Tolerance.PublishedFlowExponent, "λ2");
        Tolerance.Close(-14.5723, result.Lyapunov[2], Tolerance.PublishedFlowExponent * 2, "λ3");
        Tolerance.Relative(-(10 + 1 + (8.0 / 3)), result.Lyapunov.Sum(), 1e-6, "Σλ");
        Tolerance.Relative(-(10 + 1 + (8.0 / 3)), result.LogDetMean, 1e-9, "mean ∇·f");
    }

    // Van der Pol x'' − μ(1 − x²)x' + x = 0 at μ = 1: period 6.6632868593 (standard value, from memory;
    // P. Amore, arXiv 2111.12198 (2021) computes it to high precision).
    [Fact]
    public void Analyze_GivesVanDerPolPeriod_ToOnePartInAMillion()
    {
        var vanDerPol = Flow(["x", "v"], ["mu"], "v", "mu*(1 - x^2)*v - x");
        var result = Analyze(vanDerPol, [2, 0], [1], new AnalysisSettings(Transient: 100, Measure: 1000, Tolerance: 1e-6, ZeroBand: 0.005));
        Assert.Equal(Regime.Periodic, result.Regime);
        Assert.Equal(1, result.Period);
        Tolerance.Relative(6.6632868593, result.PeriodTime, 1e-6, "T");
        Tolerance.Close(0, result.Lyapunov[0], 0.005, "λ1 on a limit cycle");
        Assert.True(result.Lyapunov[1] < -0.5);
    }

    // Exact: Newton's law of cooling T' = −k(T − Ta) has the single exponent −k and settles at Ta.
    [Fact]
    public void Analyze_GivesMinusK_ForNewtonCooling()
    {
        var cooling = Flow(["temp"], ["k", "ambient"], "-k*(temp - ambient)");
        var result = Analyze(cooling, [90], [0.3, 20], new AnalysisSettings(Transient: 100, Measure: 200, Tolerance: 1e-6));
        Assert.Equal(Regime.FixedPoint, result.Regime);
        Tolerance.Close(-0.3, result.Lyapunov[0], 1e-9, "λ");
        Tolerance.Close(20, result.FinalState[0], 1e-9, "T∞");
    }

    // Exact: x'' + 2ζωx' + ω²x = 0 with ζ < 1 has λ1 = λ2 = −ζω.
    [Fact]
    public void Analyze_GivesMinusZetaOmegaTwice_ForDampedOscillator()
    {
        var oscillator = Flow(["x", "v"], ["zeta", "omega"], "v", "-2*zeta*omega*v - omega^2*x");
        var result = Analyze(oscillator, [1, 0], [0.2, 2], new AnalysisSettings(Transient: 0, Measure: 400, Tolerance: 1e-6, Escape: 1e12));
        Tolerance.Close(-0.4, result.Lyapunov[0], 5e-3, "λ1");
        Tolerance.Close(-0.4, result.Lyapunov[1], 5e-3, "λ2");
        Tolerance.Relative(-0.8, result.Lyapunov.Sum(), 1e-6, "Σλ = tr A");
    }

    // Exact: the Hopf normal form r' = μr − r³, θ' = ω has for μ > 0 a cycle r = √μ of period 2π/ω with
    // exponents (0, −2μ); for μ < 0 a stable focus with the double exponent μ.
    [Fact]
    public void Analyze_FollowsTheHopfNormalForm_OnBothSides()
    {
        var hopf = Flow(["x", "y"], ["mu", "omega"], "mu*x - omega*y - x*(x^2 + y^2)", "omega*x + mu*y - y*(x^2 + y^2)");
        var settings = new AnalysisSettings(Transient: 100, Measure: 500, Tolerance: 1e-6, ZeroBand: 0.005);
        var cycle = Analyze(hopf, [0.1, 0], [0.5, 3], settings);
        Assert.Equal(Regime.Periodic, cycle.Regime);
        Tolerance.Relative(2 * Math.PI / 3, cycle.PeriodTime, 1e-7, "T");
        Tolerance.Close(0, cycle.Lyapunov[0], 0.005, "λ1");
        Tolerance.Close(-1.0, cycle.Lyapunov[1], 0.005, "λ2");
        Tolerance.Relative(Math.Sqrt(0.5), Math.Sqrt((cycle.Cycle[0][0] * cycle.Cycle[0][0]) + (cycle.Cycle[0][1] * cycle.Cycle[0][1])), 1e-6, "r");

        var focus = Analyze(hopf, [0.1, 0], [-0.2, 3], settings with { Transient = 50 });
        Assert.Equal(Regime.FixedPoint, focus.Regime);
        Tolerance.Close(-0.2, focus.Lyapunov[0], 0.01, "λ1");
        Tolerance.Close(-0.2, focus.Lyapunov[1], 0.01, "λ2");
    }

    // Exact: the Brusselator has its equilibrium (A, B/A), stable for B < 1 + A², a limit cycle beyond.
    [Theory]
    [InlineData(1.5, Regime.FixedPoint)]
    [InlineData(3.0, Regime.Periodic)]
    public void Analyze_FindsBrusselatorEquilibriumOrCycle_AroundB(double b, Regime expected)
    {
        var brusselator = Flow(["x", "y"], ["a", "b"], "a - (b + 1)*x + x^2*y", "b*x - x^2*y");
        var result = Analyze(brusselator, [1.2, 1.2], [1, b], new AnalysisSettings(Transient: 200, Measure: 400, Tolerance: 1e-6, ZeroBand: 0.005));
        Assert.Equal(expected, result.Regime);
        if (expected == Regime.FixedPoint)
        {
            Tolerance.Close(1, result.FinalState[0], 1e-6, "x*");
            Tolerance.Close(b, result.FinalState[1], 1e-6, "y*");
        }
    }

    // Common practice: a lightly forced, damped, hardening oscillator responds at the forcing period.
    // Exact: ∇·f = −δ, so the two exponents sum to −δ.
    [Fact]
    public void Analyze_SamplesStroboscopically_ForAForcedOscillator()
    {
        var source = new ModelSource(
            ModelKind.Flow, ["x", "v"], ["delta", "gamma", "w"], ["v", "-delta*v - x - x^3 + gamma*cos(w*t)"], 2 * Math.PI / 1.2);
        Assert.True(Model.TryBuild(source, out var model, out _));
        var result = new FlowAnalyzer(model!, new AnalysisSettings(Transient: 200, Measure: 300, Tolerance: 1e-6), Precise, new SectionSettings())
            .Analyze([0, 0], [0.3, 0.1, 1.2]);
        Assert.Equal(Regime.Periodic, result.Regime);
        Assert.Equal(1, result.Period);
        Tolerance.Relative(2 * Math.PI / 1.2, result.PeriodTime, 1e-12, "T");
        Assert.True(result.Lyapunov[0] < 0);
        Tolerance.Relative(-0.3, result.Lyapunov.Sum(), 1e-6, "Σλ");
    }

    // Common practice: a one-dimensional autonomous flow settles or runs away, never oscillates.
    [Fact]
    public void Analyze_SettlesOrDiverges_ForOneDimensionalFlows()
    {
        var bistable = Flow(["x"], [], "x - x^3");
        var settled = Analyze(bistable, [0.2], [], new AnalysisSettings(Transient: 50, Measure: 100, Tolerance: 1e-6));
        Assert.Equal(Regime.FixedPoint, settled.Regime);
        Tolerance.Close(1, settled.FinalState[0], 1e-9, "x*");
        Tolerance.Close(-2, settled.Lyapunov[0], 1e-6, "λ = f'(1)");

        var growth = Flow(["x"], [], "x");
        var gone = Analyze(growth, [1], [], new AnalysisSettings(Transient: 50, Measure: 100, Tolerance: 1e-6));
        Assert.Equal(Regime.Divergent, gone.Regime);
        Assert.Contains("escaped", gone.Reason);

        // Exact: x' = x² from x(0) = 1 is 1/(1 − t), infinite at t = 1.
        var blowUp = Flow(["x"], [], "x^2");
        var exploded = Analyze(blowUp, [1], [], new AnalysisSettings(Transient: 50, Measure: 100, Tolerance: 1e-6));
        Assert.Equal(Regime.Divergent, exploded.Regime);
        Assert.Contains("blew up near t = 1", exploded.Reason);
    }

    // Exact: the Lorenz equilibria are the origin and (±√(β(ρ−1)), ±√(β(ρ−1)), ρ−1); at ρ = 10 < ρ_H = 470/19 the
    // pair C± is stable (Strogatz, Nonlinear Dynamics and Chaos, 1994, §9.2), and the orbit settles on one.
    [Fact]
    public void Equilibria_OfLorenz_AreLocatedAndClassified()
    {
        var model = Lorenz();
        var found = new FixedPointFinder(model).Find(FixedPointFinder.Starts([[1, 1, 1], [8, 8, 27], [-8, -8, 27]], 3), [10, 10, 8.0 / 3]);
        var c = Math.Sqrt(8.0 / 3 * 9);
        Assert.Equal(3, found.Count);
        Tolerance.Close(-c, found[0].State[0], 1e-9, "C−");
        Assert.Equal(FixedPointKind.StableSpiral, found[0].Kind);
        Assert.Equal(FixedPointKind.Saddle, found[1].Kind);
        Tolerance.Close(c, found[2].State[0], 1e-9, "C+");

        var settled = Analyze(model, [1, 1, 1], [10, 10, 8.0 / 3], new AnalysisSettings(Transient: 100, Measure: 200, Tolerance: 1e-6));
        Assert.Equal(Regime.FixedPoint, settled.Regime);
        Tolerance.Close(9, settled.FinalState[2], 1e-6, "z* = ρ − 1");
    }

    // Exact: C± lose stability at ρ_H = σ(σ + β + 3)/(σ − β − 1) = 470/19 = 24.7368421 (Strogatz 1994, §9.2):
    // the complex pair of the Jacobian at C± crosses the imaginary axis there.
    [Theory]
    [InlineData(24.5, FixedPointKind.StableSpiral)]
    [InlineData(25.0, FixedPointKind.Saddle)]
    public void Equilibria_OfLorenz_LoseStabilityAtThePublishedHopfValue(double rho, FixedPointKind expected)
    {
        var c = Math.Sqrt(8.0 / 3 * (rho - 1));
        var found = new FixedPointFinder(Lorenz()).Find([[c, c, rho - 1]], [10, rho, 8.0 / 3]);
        var point = Assert.Single(found);
        Assert.Equal(expected, point.Kind);
        var pair = point.Eigenvalues.Where(e => Math.Abs(e.Imaginary) > 1e-9).ToArray();
        Assert.Equal(2, pair.Length);
        Assert.Equal(rho > 470.0 / 19, pair[0].Real > 0);
    }

    // Exact: tr J = B − 1 − A² and det J = A² at (A, B/A), so the equilibrium is a stable focus for
    // B < 1 + A² and an unstable one beyond, where the orbit settles on a limit cycle instead.
    [Theory]
    [InlineData(1.8, FixedPointKind.StableSpiral, Regime.FixedPoint)]
    [InlineData(2.3, FixedPointKind.UnstableSpiral, Regime.Periodic)]
    public void Brusselator_TurnsIntoALimitCycle_AtBEqualsOnePlusASquared(double b, FixedPointKind kind, Regime regime)
    {
        var brusselator = Flow(["x", "y"], ["a", "b"], "a - (b + 1)*x + x^2*y", "b*x - x^2*y");
        var equilibrium = Assert.Single(new FixedPointFinder(brusselator).Find([[1.1, 1.1]], [1, b]));
        Tolerance.Close(1, equilibrium.State[0], 1e-12, "x* = A");
        Tolerance.Close(b, equilibrium.State[1], 1e-12, "y* = B/A");
        Assert.Equal(kind, equilibrium.Kind);
        var result = Analyze(brusselator, [1.2, 1.2], [1, b], new AnalysisSettings(Transient: 400, Measure: 400, Tolerance: 1e-6, ZeroBand: 0.005));
        Assert.Equal(regime, result.Regime);
    }

    // Common practice: a one-variable autonomous flow is monotone between equilibria, so it can settle,
    // run away or (honestly) be unresolved within the time given — never cycle or be chaotic.
    [Fact]
    public void Analyze_NeverCyclesOrIsChaotic_ForRandomOneVariableFlows()
    {
        var coefficients = Gen.Double[-2, 2].Array[4];
        Gen.Select(coefficients, Gen.Double[-3, 3]).Sample((c, x0) =>
        {
            var text = FormattableString.Invariant($"{c[0]:R} + {c[1]:R}*x + {c[2]:R}*x^2 + {c[3]:R}*x^3");
            var model = Flow(["x"], [], text.Replace("+ -", "- ", StringComparison.Ordinal));
            var result = Analyze(model, [x0], [], new AnalysisSettings(Transient: 20, Measure: 40, Tolerance: 1e-6), new IntegratorSettings(IntegratorMethod.Dopri5, 0.01, 1e-8, 1e-10));
            return result.Regime is Regime.FixedPoint or Regime.Divergent or Regime.Unresolved && result.Period == 0;
        }, iter: 60, threads: 1);
    }

    // Exact: explicit Euler multiplies a damped oscillator's amplitude by |1 + hλ| per step, which
    // exceeds 1 for h > 2ζ/ω (0.2 here): at h = 0.25 the decaying oscillator appears to grow, at 0.125 it
    // decays. The step check reports the disagreement; with RK4 at a fine step both runs agree.
    [Fact]
    public void StepCheck_FlagsAPointWhoseRegimeDependsOnTheStep()
    {
        var oscillator = Flow(["x", "v"], ["zeta", "omega"], "v", "-2*zeta*omega*v - omega^2*x");
        var settings = new AnalysisSettings(Transient: 50, Measure: 100, Tolerance: 1e-6);
        IPointAnalyzer Make(IntegratorSettings integrator) => new FlowAnalyzer(oscillator, settings, integrator, new SectionSettings());
        var coarse = new IntegratorSettings(IntegratorMethod.Euler, 0.25);
        var flagged = new CrossCheckedAnalyzer(Make(coarse), Make(coarse with { Step = 0.125 }), "step", "half the step").Analyze([1, 0], [0.2, 2]);
        Assert.Equal(Regime.Unresolved, flagged.Regime);
        Assert.StartsWith("step: ", flagged.Reason);

        var fine = new IntegratorSettings(IntegratorMethod.Rk4, 0.01);
        var agreed = new CrossCheckedAnalyzer(Make(fine), Make(fine with { Step = 0.005 }), "step", "half the step").Analyze([1, 0], [0.2, 2]);
        Assert.Equal(Regime.FixedPoint, agreed.Regime);
    }
}
