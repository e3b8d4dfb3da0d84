using System.Runtime.CompilerServices;

namespace FitSpec.Expressions;

/// <summary>Parses the expression language into an immutable tree; never throws.</summary>
public static class ExpressionParser
{
    /// <summary>
    /// Errors reported for one expression. Past a few, more are echoes of the same mistake, and every caller
    /// turns each into a message quoting the expression: a long garbled text would otherwise cost its length
    /// times its error count.
    /// </summary>
    public const int MaxErrors = 10;

    public static ParsedExpression Parse(string text, ExpressionContext context)
    {
        text ??= "";
        var errors = new List<ExprError>();
        var tokens = Lexer.Tokenize(text, errors);
        var root = new Parser(text, tokens, errors).ParseAll();
        if (root is not null)
        {
            new ContextChecker(context, errors).CheckRoot(root);
        }

        // A stable sort keeps lexer-then-parser order for errors at the same offset.
        var ordered = errors.OrderBy(e => e.Offset).ToArray();
        if (ordered.Length > MaxErrors)
        {
            var rest = ordered[MaxErrors - 1];
            ordered = [.. ordered[..(MaxErrors - 1)], rest with { Message = $"{rest.Message} (and {ordered.Length - MaxErrors} more errors after this one)" }];
        }

        return new ParsedExpression(text, ordered.Length == 0 ? root : null, ordered);
    }
}

/// <summary>
/// Recursive descent over the token list. A syntax error is fatal (later errors would mostly be echoes of it);
/// unknown functions and wrong argument counts are recorded and parsing goes on, so several can be reported.
/// </summary>
internal sealed class Parser
{
    // Nesting counts parentheses, calls, unary signs, 'not' and exponents: the parser recurses on each.
    internal const int MaxNesting = 256;

    // Long flat chains ('a + b + c ...') are parsed in a loop but build a tree this tall, and every later walk
    // over the tree recurses on it; the bound keeps those walks well inside a thread's stack.
    internal const int MaxHeight = 1024;

    private const string AllowedFunctions = "log exp sqrt abs min max";

    private readonly string _text;
    private readonly List<Token> _tokens;
    private readonly List<ExprError> _errors;
    private int _position;
    private int _nesting;
    private bool _fatal;

    internal Parser(string text, List<Token> tokens, List<ExprError> errors)
    {
        _text = text;
        _tokens = tokens;
        _errors = errors;
    }

    private Token Current => _tokens[_position];

    private Token? Previous => _position > 0 ? _tokens[_position - 1] : null;

    /// <summary>The tree, or null after a fatal error.</summary>
    internal Expr? ParseAll()
    {
        if (Current.Kind == TokenKind.End)
        {
            _errors.Add(new ExprError(0, _text.Length, "the expression is empty"));
            return null;
        }

        var result = ParseOr();
        if (!_fatal && Current.Kind != TokenKind.End)
        {
            ReportAfterOperand(null);
        }

        return _fatal ? null : result.Expr;
    }

    private Node ParseOr()
    {
        var left = ParseAnd();
        while (!_fatal && Current.Kind == TokenKind.Or)
        {
            var op = Advance();
            var right = ParseAnd();
            left = MakeLogical(LogicalOperator.Or, left, right, op);
        }

        return left;
    }

    private Node ParseAnd()
    {
        var left = ParseNot();
        while (!_fatal && Current.Kind == TokenKind.And)
        {
            var op = Advance();
            var right = ParseNot();
            left = MakeLogical(LogicalOperator.And, left, right, op);
        }

        return left;
    }

    private Node ParseNot()
    {
        if (_fatal || Current.Kind != TokenKind.Not)
        {
            return ParseComparison();
        }

        var keyword = Advance();
        if (!Enter(keyword))
        {
            return Node.Invalid;
        }

        var operand = ParseNot();
        _nesting--;
        return Make(new NotExpr(operand.Expr, keyword.Start, operand.Expr.End - keyword.Start), operand.Height + 1);
    }

    private Node ParseComparison()
    {
        var left = ParseAdditive();
        if (_fatal || ComparisonOf(Current.Kind) is not { } first)
        {
            return left;
        }

        var op = Advance();
        var right = ParseAdditive();
        var result = Make(
            new ComparisonExpr(first, left.Expr, right.Expr, left.Expr.Start, right.Expr.End - left.Expr.Start)
            {
                OperatorStart = op.Start,
            },
            Math.Max(left.Height, right.Height) + 1);

        // Non-associative: report each extra comparison, then keep going to find later errors.
        while (!_fatal && ComparisonOf(Current.Kind) is not null)
        {
            var extra = Advance();
            Error(extra, "comparisons cannot be chained; combine them with 'and', e.g. 'a < b and b < c'");
            ParseAdditive();
        }

        return result;
    }

    private Node ParseAdditive()
    {
        var left = ParseMultiplicative();
        while (!_fatal && Current.Kind is TokenKind.Plus or TokenKind.Minus)
        {
            var op = Advance();
            var right = ParseMultiplicative();
            left = MakeBinary(op.Kind == TokenKind.Plus ? BinaryOperator.Add : BinaryOperator.Subtract, left, right, op);
        }

        return left;
    }

    private Node ParseMultiplicative()
    {
        var left = ParseUnary();
        while (!_fatal && Current.Kind is TokenKind.Star or TokenKind.Slash)
        {
            var op = Advance();
            var right = ParseUnary();
            left = MakeBinary(op.Kind == TokenKind.Star ? BinaryOperator.Multiply : BinaryOperator.Divide, left, right, op);
        }

        return left;
    }

    // Unary signs bind looser than '^' so that '-x^2' is '-(x^2)'.
    private Node ParseUnary() =>
        !_fatal && Current.Kind is TokenKind.Minus or TokenKind.Plus ? ParseSigned(ParseUnary) : ParsePower();

    private Node ParsePower()
    {
        var baseNode = ParsePrimary();
        if (_fatal || Current.Kind != TokenKind.Caret)
        {
            return baseNode;
        }

        var op = Advance();
        if (!Enter(op))
        {
            return Node.Invalid;
        }

        // Right-associative, and a signed exponent is allowed: '2^-1' and '2^3^2' = 2^(3^2).
        var exponent = ParseExponent();
        _nesting--;
        return MakeBinary(BinaryOperator.Power, baseNode, exponent, op);
    }

    private Node ParseExponent() =>
        !_fatal && Current.Kind is TokenKind.Minus or TokenKind.Plus ? ParseSigned(ParseExponent) : ParsePower();

    private Node ParseSigned(Func<Node> operandParser)
    {
        var sign = Advance();
        if (!Enter(sign))
        {
            return Node.Invalid;
        }

        var operand = operandParser();
        _nesting--;
        var op = sign.Kind == TokenKind.Minus ? UnaryOperator.Negate : UnaryOperator.Plus;
        return Make(new UnaryExpr(op, operand.Expr, sign.Start, operand.Expr.End - sign.Start), operand.Height + 1);
    }

    private Node ParsePrimary()
    {
        if (_fatal)
        {
            return Node.Invalid;
        }

        var token = Current;
        switch (token.Kind)
        {
            case TokenKind.Number:
                Advance();
                return new Node(new NumberExpr(token.Number, token.Start, token.Length), 1);
            case TokenKind.QuotedName:
                Advance();
                return new Node(new ColumnExpr(token.Name!, token.Start, token.Length), 1);
            case TokenKind.Name when _tokens[_position + 1].Kind == TokenKind.LeftParen:
                return ParseCall();
            case TokenKind.Name:
                Advance();
                return new Node(new ColumnExpr(token.Name!, token.Start, token.Length), 1);
            case TokenKind.LeftParen:
                return ParseGroup();
            default:
                ReportMissingOperand();
                return Node.Invalid;
        }
    }

    private Node ParseGroup()
    {
        var open = Advance();
        if (!Enter(open))
        {
            return Node.Invalid;
        }

        if (Current.Kind == TokenKind.RightParen)
        {
            Fatal(open.Start, Current.End - open.Start, "empty parentheses");
            return Node.Invalid;
        }

        var inner = ParseOr();
        _nesting--;
        if (_fatal)
        {
            return Node.Invalid;
        }

        if (Current.Kind != TokenKind.RightParen)
        {
            ReportAfterOperand(open);
            return Node.Invalid;
        }

        var close = Advance();

        // The node's span grows to cover the parentheses, so a parent's span is contiguous source text.
        return new Node(inner.Expr with { Start = open.Start, Length = close.End - open.Start }, inner.Height);
    }

    private Node ParseCall()
    {
        var name = Advance();
        var open = Advance();
        if (!Enter(open))
        {
            return Node.Invalid;
        }

        var arguments = new List<Expr>();
        var height = 0;
        if (Current.Kind != TokenKind.RightParen)
        {
            while (true)
            {
                var argument = ParseOr();
                if (_fatal)
                {
                    return Node.Invalid;
                }

                arguments.Add(argument.Expr);
                height = Math.Max(height, argument.Height);
                if (Current.Kind == TokenKind.RightParen)
                {
                    break;
                }

                if (Current.Kind != TokenKind.Comma)
                {
                    ReportAfterOperand(open);
                    return Node.Invalid;
                }

                var comma = Advance();
                if (Current.Kind is TokenKind.RightParen or TokenKind.End)
                {
                    Fatal(comma.Start, comma.Length, "expected an argument after ','");
                    return Node.Invalid;
                }
            }
        }

        var close = Advance();
        _nesting--;
        var start = name.Start;
        var length = close.End - start;
        if (FunctionOf(name.Name!) is not { } function)
        {
            Error(name, $"unknown function '{name.Name}' (allowed: {AllowedFunctions}){Hint(name.Name!)}");

            // A placeholder keeps the rest checkable; any error means no tree is returned, so it never escapes.
            return Make(new NumberExpr(double.NaN, start, length), height + 1);
        }

        var count = arguments.Count;
        if (function is FunctionName.Min or FunctionName.Max)
        {
            if (count < 2)
            {
                _errors.Add(new ExprError(start, length, $"'{name.Name}' takes at least 2 arguments, got {count}"));
            }
        }
        else if (count != 1)
        {
            _errors.Add(new ExprError(start, length, $"'{name.Name}' takes 1 argument, got {count}"));
        }

        return Make(new CallExpr(function, arguments.ToArray(), start, length), height + 1);
    }

    private static FunctionName? FunctionOf(string name) => name switch
    {
        "log" => FunctionName.Log,
        "exp" => FunctionName.Exp,
        "sqrt" => FunctionName.Sqrt,
        "abs" => FunctionName.Abs,
        "min" => FunctionName.Min,
        "max" => FunctionName.Max,
        _ => null,
    };

    private static string Hint(string name)
    {
        if (FunctionOf(name.ToLowerInvariant()) is not null)
        {
            return $"; did you mean '{name.ToLowerInvariant()}'?";
        }

        return name.ToLowerInvariant() switch
        {
            "ln" => "; 'log' is the natural logarithm",
            "pow" or "power" => "; use '^' for powers",
            _ => "",
        };
    }

    private static ComparisonOperator? ComparisonOf(TokenKind kind) => kind switch
    {
        TokenKind.Less => ComparisonOperator.Less,
        TokenKind.LessEqual => ComparisonOperator.LessOrEqual,
        TokenKind.Greater => ComparisonOperator.Greater,
        TokenKind.GreaterEqual => ComparisonOperator.GreaterOrEqual,
        TokenKind.EqualEqual => ComparisonOperator.Equal,
        TokenKind.NotEqual => ComparisonOperator.NotEqual,
        _ => null,
    };

    /// <summary>An operand was required but the current token cannot start one.</summary>
    private void ReportMissingOperand()
    {
        var token = Current;
        var previous = Previous;
        if (token.Kind == TokenKind.Error)
        {
            _fatal = true;
        }
        else if (previous is not { } prev)
        {
            Fatal(token, token.Kind switch
            {
                TokenKind.RightParen => "unexpected ')'",
                TokenKind.Comma => "unexpected ','",
                _ => $"expected an operand before '{TextOf(token)}'",
            });
        }
        else if (token.Kind == TokenKind.End)
        {
            // Pointing at the dangling operator is more visible than a zero-width mark at the end.
            Fatal(prev, prev.Kind == TokenKind.LeftParen ? "missing ')' to match this '('" : $"expected an operand after '{TextOf(prev)}'");
        }
        else if (prev.Kind == TokenKind.Comma)
        {
            Fatal(token, "expected an argument after ','");
        }
        else
        {
            Fatal(token, $"expected an operand after '{TextOf(prev)}'");
        }
    }

    /// <summary>
    /// A complete operand is followed by a token that cannot continue it. <paramref name="open"/> is the
    /// innermost unclosed '(' (null at top level).
    /// </summary>
    private void ReportAfterOperand(Token? open)
    {
        var token = Current;
        switch (token.Kind)
        {
            case TokenKind.Error:
                _fatal = true;
                break;
            case TokenKind.End when open is { } paren:
                Fatal(paren, "missing ')' to match this '('");
                break;
            case TokenKind.RightParen:
                Fatal(token, "unexpected ')'");
                break;
            case TokenKind.Comma:
                Fatal(token, "unexpected ','; commas only separate function arguments");
                break;
            default:
                var previous = Previous is { } prev ? TextOf(prev) : "";
                Fatal(token, $"missing operator between '{previous}' and '{TextOf(token)}'");
                break;
        }
    }

    private string TextOf(Token token) =>
        token.Kind == TokenKind.End ? "end of input" : _text.Substring(token.Start, token.Length);

    private bool Enter(Token at)
    {
        // The stack probe is a second guard for callers that already run deep in their own stack.
        if (++_nesting > MaxNesting || !RuntimeHelpers.TryEnsureSufficientExecutionStack())
        {
            Fatal(at, $"the expression is nested too deeply (more than {MaxNesting} levels)");
            return false;
        }

        return true;
    }

    private Token Advance() => _tokens[_position < _tokens.Count - 1 ? _position++ : _position];

    private Node MakeBinary(BinaryOperator op, Node left, Node right, Token opToken) =>
        _fatal
            ? Node.Invalid
            : Make(
                new BinaryExpr(op, left.Expr, right.Expr, left.Expr.Start, right.Expr.End - left.Expr.Start)
                {
                    OperatorStart = opToken.Start,
                },
                Math.Max(left.Height, right.Height) + 1);

    private Node MakeLogical(LogicalOperator op, Node left, Node right, Token opToken) =>
        _fatal
            ? Node.Invalid
            : Make(
                new LogicalExpr(op, left.Expr, right.Expr, left.Expr.Start, right.Expr.End - left.Expr.Start)
                {
                    OperatorStart = opToken.Start,
                },
                Math.Max(left.Height, right.Height) + 1);

    private Node Make(Expr expr, int height)
    {
        if (_fatal)
        {
            return Node.Invalid;
        }

        if (height > MaxHeight)
        {
            Fatal(expr.Start, expr.Length, $"the expression is too long (more than {MaxHeight} levels of operations); split it up");
            return Node.Invalid;
        }

        return new Node(expr, height);
    }

    private void Error(Token token, string message) => _errors.Add(new ExprError(token.Start, token.Length, message));

    private void Fatal(Token token, string message) => Fatal(token.Start, token.Length, message);

    private void Fatal(int start, int length, string message)
    {
        if (!_fatal)
        {
            _errors.Add(new ExprError(start, length, message));
            _fatal = true;
        }
    }

    /// <summary>A parsed subtree with its height, tracked so over-tall trees are refused while building.</summary>
    private readonly record struct Node(Expr Expr, int Height)
    {
        internal static Node Invalid { get; } = new(new NumberExpr(double.NaN, 0, 0), 1);
    }
}
