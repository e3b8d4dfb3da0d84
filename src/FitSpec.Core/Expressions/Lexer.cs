using System.Globalization;

namespace FitSpec.Expressions;

internal enum TokenKind
{
    End,

    /// <summary>Text the lexer already reported; the parser stops here without piling on more errors.</summary>
    Error,
    Number,
    Name,
    QuotedName,
    Plus,
    Minus,
    Star,
    Slash,
    Caret,
    LeftParen,
    RightParen,
    Comma,
    Less,
    LessEqual,
    Greater,
    GreaterEqual,
    EqualEqual,
    NotEqual,
    And,
    Or,
    Not,
}

internal readonly record struct Token(TokenKind Kind, int Start, int Length, double Number = 0, string? Name = null)
{
    internal int End => Start + Length;
}

/// <summary>Splits expression text into tokens, reporting every lexical error rather than only the first.</summary>
internal static class Lexer
{
    internal static List<Token> Tokenize(string text, List<ExprError> errors)
    {
        var tokens = new List<Token>();
        var i = 0;
        while (i < text.Length)
        {
            var c = text[i];
            if (char.IsWhiteSpace(c))
            {
                i++;
                continue;
            }

            var start = i;
            if (char.IsAsciiDigit(c) || (c == '.' && i + 1 < text.Length && char.IsAsciiDigit(text[i + 1])))
            {
                tokens.Add(LexNumber(text, ref i, errors));
            }
            else if (IsNameStart(c))
            {
                while (i < text.Length && IsNamePart(text[i]))
                {
                    i++;
                }

                var name = text[start..i];
                var kind = name switch
                {
                    "and" => TokenKind.And,
                    "or" => TokenKind.Or,
                    "not" => TokenKind.Not,
                    _ => TokenKind.Name,
                };
                tokens.Add(new Token(kind, start, i - start, Name: name));
            }
            else if (c == '`')
            {
                var close = text.IndexOf('`', i + 1);
                if (close < 0)
                {
                    errors.Add(new ExprError(start, text.Length - start, "unterminated backtick-quoted name"));
                    tokens.Add(new Token(TokenKind.Error, start, text.Length - start));
                    i = text.Length;
                }
                else
                {
                    i = close + 1;
                    var name = text[(start + 1)..close];
                    if (name.Length == 0)
                    {
                        errors.Add(new ExprError(start, 2, "empty backtick-quoted name"));
                        tokens.Add(new Token(TokenKind.Error, start, 2));
                    }
                    else
                    {
                        tokens.Add(new Token(TokenKind.QuotedName, start, i - start, Name: name));
                    }
                }
            }
            else
            {
                tokens.Add(LexSymbol(text, ref i, errors));
            }
        }

        tokens.Add(new Token(TokenKind.End, text.Length, 0));
        return tokens;
    }

    /// <summary>True when a name can be written without backticks (and is not a keyword).</summary>
    internal static bool IsPlainName(string name)
    {
        if (name.Length == 0 || !IsNameStart(name[0]) || name is "and" or "or" or "not")
        {
            return false;
        }

        foreach (var c in name)
        {
            if (!IsNamePart(c))
            {
                return false;
            }
        }

        return true;
    }

    /// <summary>The name as it must be written in an expression.</summary>
    internal static string Quote(string name) => IsPlainName(name) ? name : $"`{name}`";

    private static bool IsNameStart(char c) => char.IsAsciiLetter(c) || c == '_';

    private static bool IsNamePart(char c) => char.IsAsciiLetterOrDigit(c) || c == '_';

    private static Token LexNumber(string text, ref int i, List<ExprError> errors)
    {
        var start = i;
        SkipDigitsAndDots(text, ref i);

        // The exponent is taken only when digits follow, so '2e' and '2exp(x)' read as a number then a name.
        if (i < text.Length && (text[i] == 'e' || text[i] == 'E'))
        {
            var j = i + 1;
            if (j < text.Length && (text[j] == '+' || text[j] == '-'))
            {
                j++;
            }

            if (j < text.Length && char.IsAsciiDigit(text[j]))
            {
                i = j;
                SkipDigitsAndDots(text, ref i);
            }
        }

        var literal = text.AsSpan(start, i - start);
        if (!double.TryParse(
                literal,
                NumberStyles.AllowDecimalPoint | NumberStyles.AllowExponent,
                CultureInfo.InvariantCulture,
                out var value))
        {
            errors.Add(new ExprError(start, i - start, $"malformed number '{literal}'"));
            return new Token(TokenKind.Error, start, i - start);
        }

        if (double.IsInfinity(value))
        {
            errors.Add(new ExprError(start, i - start, $"number '{literal}' is too large"));
            return new Token(TokenKind.Error, start, i - start);
        }

        return new Token(TokenKind.Number, start, i - start, Number: value);
    }

    // Dots are swallowed greedily so '1.2.3' is one malformed number, not two numbers side by side.
    private static void SkipDigitsAndDots(string text, ref int i)
    {
        while (i < text.Length && (char.IsAsciiDigit(text[i]) || text[i] == '.'))
        {
            i++;
        }
    }

    private static Token LexSymbol(string text, ref int i, List<ExprError> errors)
    {
        var start = i;
        var (kind, length, message) = Symbol(text[i], i + 1 < text.Length ? text[i + 1] : '\0');
        if (length == 0)
        {
            return UnexpectedCharacter(text, ref i, errors);
        }

        i = start + length;
        if (message is not null)
        {
            errors.Add(new ExprError(start, length, message));
        }

        return new Token(kind, start, length);
    }

    /// <summary>The operator starting with c (length 0 if none); a message marks a likely typo from another language.</summary>
    private static (TokenKind Kind, int Length, string? Message) Symbol(char c, char next) => c switch
    {
        '+' => (TokenKind.Plus, 1, null),
        '-' => (TokenKind.Minus, 1, null),
        '*' when next == '*' => (TokenKind.Error, 2, "'**' is not an operator; use '^' for powers"),
        '*' => (TokenKind.Star, 1, null),
        '/' => (TokenKind.Slash, 1, null),
        '^' => (TokenKind.Caret, 1, null),
        '(' => (TokenKind.LeftParen, 1, null),
        ')' => (TokenKind.RightParen, 1, null),
        ',' => (TokenKind.Comma, 1, null),
        '<' when next == '=' => (TokenKind.LessEqual, 2, null),
        '<' when next == '>' => (TokenKind.Error, 2, "'<>' is not an operator; use '!=' to test inequality"),
        '<' => (TokenKind.Less, 1, null),
        '>' when next == '=' => (TokenKind.GreaterEqual, 2, null),
        '>' => (TokenKind.Greater, 1, null),
        '=' when next == '=' => (TokenKind.EqualEqual, 2, null),
        '=' when next == '<' => (TokenKind.Error, 2, "'=<' is not an operator; use '<='"),
        '=' when next == '>' => (TokenKind.Error, 2, "'=>' is not an operator; use '>='"),
        '=' => (TokenKind.Error, 1, "'=' is not an operator; use '==' to compare"),
        '!' when next == '=' => (TokenKind.NotEqual, 2, null),
        '!' => (TokenKind.Error, 1, "'!' is not an operator; use 'not' to negate a condition"),
        '&' when next == '&' => (TokenKind.Error, 2, "'&&' is not an operator; use 'and'"),
        '&' => (TokenKind.Error, 1, "'&' is not an operator; use 'and'"),
        '|' when next == '|' => (TokenKind.Error, 2, "'||' is not an operator; use 'or'"),
        '|' => (TokenKind.Error, 1, "'|' is not an operator; use 'or'"),
        _ => (TokenKind.Error, 0, null),
    };

    private static Token UnexpectedCharacter(string text, ref int i, List<ExprError> errors)
    {
        var start = i;
        var length = char.IsHighSurrogate(text[i]) && i + 1 < text.Length && char.IsLowSurrogate(text[i + 1]) ? 2 : 1;
        i += length;
        var shown = text.Substring(start, length);
        string message;
        if (length == 1 && (char.IsControl(shown[0]) || char.IsSurrogate(shown[0])))
        {
            message = $"unexpected character U+{(int)shown[0]:X4}";
        }
        else if (char.IsLetter(shown, 0))
        {
            message = $"unexpected character '{shown}' (names with other characters must be quoted in backticks, "
                + "e.g. `temp (C)`)";
        }
        else
        {
            message = $"unexpected character '{shown}'";
        }

        errors.Add(new ExprError(start, length, message));
        return new Token(TokenKind.Error, start, length);
    }
}
