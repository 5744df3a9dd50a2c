//! Tokens with their 1-based columns (in characters).

use super::node::Number;
use rug::Integer;

/// Largest accepted decimal exponent of a literal, after normalisation.
pub(crate) const MAX_EXP10: i64 = 100_000;

/// Single-letter Greek names.
pub(crate) const GREEK: [char; 8] = ['θ', 'ξ', 'α', 'β', 'γ', 'λ', 'μ', 'ν'];

#[derive(Clone, Debug, PartialEq)]
pub(crate) enum Tok {
    Number(Number),
    Name(String),
    Plus,
    Minus,
    Star,
    Slash,
    Caret,
    LParen,
    RParen,
    Comma,
    End,
}

/// A token, its column and its source text.
#[derive(Clone, Debug)]
pub(crate) struct Token {
    pub tok: Tok,
    pub col: usize,
    pub text: String,
}

/// A lexing or parsing failure: column and message.
#[derive(Clone, Debug)]
pub(crate) struct Fail {
    pub col: usize,
    pub message: String,
}

pub(crate) fn fail<T>(col: usize, message: impl Into<String>) -> Result<T, Fail> {
    Err(Fail {
        col,
        message: message.into(),
    })
}

fn is_name_start(c: char) -> bool {
    c.is_ascii_alphabetic() || c == '_'
}

fn is_name_char(c: char) -> bool {
    c.is_ascii_alphanumeric() || c == '_'
}

/// Splits `src` into tokens, ending with [`Tok::End`] at column `len + 1`.
pub(crate) fn lex(src: &str) -> Result<Vec<Token>, Fail> {
    let chars: Vec<char> = src.chars().collect();
    let mut out = Vec::new();
    let mut p = 0;
    while p < chars.len() {
        let c = chars[p];
        let col = p + 1;
        if c.is_whitespace() {
            p += 1;
            continue;
        }
        let single = match c {
            '+' => Some(Tok::Plus),
            '-' | '−' => Some(Tok::Minus),
            '*' => Some(Tok::Star),
            '/' => Some(Tok::Slash),
            '^' => Some(Tok::Caret),
            '(' => Some(Tok::LParen),
            ')' => Some(Tok::RParen),
            ',' => Some(Tok::Comma),
            _ => None,
        };
        if let Some(tok) = single {
            out.push(Token {
                tok,
                col,
                text: c.to_string(),
            });
            p += 1;
            continue;
        }
        if c.is_ascii_digit() {
            let (tok, end) = number(&chars, p)?;
            out.push(Token {
                tok,
                col,
                text: chars[p..end].iter().collect(),
            });
            p = end;
            continue;
        }
        if is_name_start(c) {
            let mut end = p;
            while end < chars.len() && is_name_char(chars[end]) {
                end += 1;
            }
            let name: String = chars[p..end].iter().collect();
            out.push(Token {
                tok: Tok::Name(name.clone()),
                col,
                text: name,
            });
            p = end;
            continue;
        }
        if GREEK.contains(&c) || c == 'π' {
            let name = if c == 'π' {
                "pi".to_string()
            } else {
                c.to_string()
            };
            out.push(Token {
                tok: Tok::Name(name),
                col,
                text: c.to_string(),
            });
            p += 1;
            continue;
        }
        let hint = match c {
            '.' => "a number starts with a digit: write 0.5, not .5".to_string(),
            '×' | '·' | '⋅' => "write '*' for multiplication".to_string(),
            '÷' => "write '/' for division".to_string(),
            '[' | ']' | '{' | '}' => "use '(' and ')' for grouping".to_string(),
            'Α'..='Ω' | 'α'..='ω' => {
                let g: String = GREEK.iter().collect();
                format!(
                    "the Greek letters usable as names are {g} (and π for pi); \
                     otherwise use an ASCII name"
                )
            }
            _ => "expected a number, a name, an operator (+ - * / ^), a parenthesis or a comma"
                .to_string(),
        };
        return fail(col, format!("unexpected character '{c}' — {hint}"));
    }
    out.push(Token {
        tok: Tok::End,
        col: chars.len() + 1,
        text: String::new(),
    });
    Ok(out)
}

/// Scans `digits [ '.' digits ] [ ('e'|'E') ['+'|'-'] digits ]` from `start`.
fn number(chars: &[char], start: usize) -> Result<(Tok, usize), Fail> {
    let digits_from = |mut q: usize| {
        while q < chars.len() && chars[q].is_ascii_digit() {
            q += 1;
        }
        q
    };
    let int_end = digits_from(start);
    let mut end = int_end;
    let mut frac = String::new();
    if end < chars.len() && chars[end] == '.' {
        let f_end = digits_from(end + 1);
        if f_end == end + 1 {
            return fail(
                end + 2,
                "expected a digit after the decimal point (write 3.0 or 3, not 3.)",
            );
        }
        frac = chars[end + 1..f_end].iter().collect();
        end = f_end;
    }
    let mut exp: i64 = 0;
    if end < chars.len() && matches!(chars[end], 'e' | 'E') {
        let mut q = end + 1;
        let mut neg = false;
        let signed = q < chars.len() && matches!(chars[q], '+' | '-' | '−');
        if signed {
            neg = chars[q] != '+';
            q += 1;
        }
        let e_end = digits_from(q);
        if e_end > q {
            for &d in &chars[q..e_end] {
                exp = (exp * 10 + d.to_digit(10).unwrap_or(0) as i64).min(10 * MAX_EXP10);
            }
            if neg {
                exp = -exp;
            }
            end = e_end;
        } else if signed {
            return fail(q + 1, "expected digits for the exponent (write e.g. 1e-3)");
        }
        // Otherwise the number ends before the letter `e`, and the parser
        // reports the missing operator.
    }
    let int: String = chars[start..int_end].iter().collect();
    let mantissa: Integer = format!("{int}{frac}").parse().unwrap_or_default();
    let exp10 = exp - frac.len() as i64;
    let digits = mantissa.to_string().len() as i64;
    let magnitude = if mantissa == 0 { 0 } else { exp10 + digits };
    if magnitude.abs() > MAX_EXP10 {
        return fail(
            start + 1,
            format!("number out of range: its decimal exponent exceeds ±{MAX_EXP10}"),
        );
    }
    Ok((Tok::Number(Number::new(mantissa, exp10)), end))
}
