namespace Sweeps.Engine; internal static class Placeholder { }
