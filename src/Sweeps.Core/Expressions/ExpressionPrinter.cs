using System.Globalization;
using System.Text;

namespace Sweeps.Core.Expressions;

/// <summary>
/// Prints a node in the model language with the fewest parentheses that keep its structure, so that
/// parsing the printed text gives back an equal node. Numbers print in round-trip form.
/// </summary>
public static class ExpressionPrinter
{
    private const int Sum = 1;
    private const int Product = 2;
    private const int Unary = 3;
    private const int Power = 4;
    private const int Atom = 5;

    public static string Print(Node node)
    {
        var builder = new StringBuilder();
        Write(builder, node, Sum);
        return builder.ToString();
    }

    private static void Write(StringBuilder builder, Node node, int context)
    {
        var own = Precedence(node);
        var wrap = own < context;
        if (wrap)
        {
            builder.Append('(');
        }

        switch (node)
        {
            case NumberNode number:
                builder.Append(number.Value.ToString("R", CultureInfo.InvariantCulture));
                break;
            case SymbolNode symbol:
                builder.Append(symbol.Name);
                break;
            case NegateNode negate:
                builder.Append('-');
                Write(builder, negate.Operand, Unary);
                break;
            case BinaryNode binary:
                WriteBinary(builder, binary);
                break;
            case CallNode call:
                builder.Append(FunctionCatalog.NameOf(call.Function)).Append('(');
                for (var i = 0; i < call.Arguments.Count; i++)
                {
                    if (i > 0)
                    {
                        builder.Append(", ");
                    }

                    Write(builder, call.Arguments[i], Sum);
                }

                builder.Append(')');
                break;
            default:
                throw new ArgumentOutOfRangeException(nameof(node));
        }

        if (wrap)
        {
            builder.Append(')');
        }
    }

    private static void WriteBinary(StringBuilder builder, BinaryNode binary)
    {
        switch (binary.Operator)
        {
            case BinaryOperator.Add or BinaryOperator.Subtract:
                Write(builder, binary.Left, Sum);
                builder.Append(binary.Operator == BinaryOperator.Add ? " + " : " - ");
                Write(builder, binary.Right, Product);
                break;
            case BinaryOperator.Multiply or BinaryOperator.Divide:
                Write(builder, binary.Left, Product);
                builder.Append(binary.Operator == BinaryOperator.Multiply ? "*" : "/");
                Write(builder, binary.Right, Unary);
                break;
            default:
                Write(builder, binary.Left, Atom);
                builder.Append('^');
                Write(builder, binary.Right, Unary);
                break;
        }
    }

    private static int Precedence(Node node) => node switch
    {
        NumberNode number => number.Value < 0 || double.IsNegative(number.Value) ? Unary : Atom,
        NegateNode => Unary,
        BinaryNode { Operator: BinaryOperator.Add or BinaryOperator.Subtract } => Sum,
        BinaryNode { Operator: BinaryOperator.Multiply or BinaryOperator.Divide } => Product,
        BinaryNode => Power,
        _ => Atom,
    };
}
