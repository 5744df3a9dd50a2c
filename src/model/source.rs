//! Where things are in a model file: byte spans to `file:line:column`, and
//! expressions read from TOML values with their position kept, so an
//! expression error points at the column in the file.

use super::schema::Scalar;
use crate::error::{Error, Result};
use crate::expr::Expr;
use std::ops::Range;
use toml::Spanned;

/// A model file's name and text.
#[derive(Clone, Debug)]
pub(crate) struct Source {
    pub name: String,
    pub text: String,
}

impl Source {
    /// 1-based line and column (in characters) of a byte offset.
    pub fn line_col(&self, offset: usize) -> (usize, usize) {
        let offset = offset.min(self.text.len());
        let before = &self.text[..offset];
        let line = before.matches('\n').count() + 1;
        let col = before
            .rsplit('\n')
            .next()
            .map(|l| l.chars().count())
            .unwrap_or(0)
            + 1;
        (line, col)
    }

    /// `file:line:column` of a byte offset.
    pub fn at(&self, offset: usize) -> String {
        let (l, c) = self.line_col(offset);
        format!("{}:{l}:{c}", self.name)
    }

    /// A model error at a span.
    pub fn error(&self, span: Range<usize>, message: impl Into<String>) -> Error {
        Error::Model {
            location: self.at(span.start),
            message: message.into(),
        }
    }

    /// A model error for the whole file.
    pub fn file_error(&self, message: impl Into<String>) -> Error {
        Error::Model {
            location: self.name.clone(),
            message: message.into(),
        }
    }

    /// Parses a TOML string value as an expression. Errors carry the file
    /// position of the offending character when the string is written on
    /// one line without escapes (the usual case), else of the string.
    pub fn expr(&self, value: &Spanned<String>) -> Result<Expr> {
        let span = value.span();
        Expr::parse(value.get_ref()).map_err(|e| self.locate(e, span, value.get_ref()))
    }

    /// Parses a number or an expression string. A TOML number is re-read
    /// from its text, so decimals stay exact (`0.35` is 7/20).
    pub fn scalar(&self, value: &Spanned<Scalar>) -> Result<Expr> {
        let span = value.span();
        match value.get_ref() {
            Scalar::Text(s) => Expr::parse(s).map_err(|e| self.locate(e, span, s)),
            Scalar::Integer(_) | Scalar::Float(_) => {
                let raw: String = self.text[span.clone()]
                    .chars()
                    .filter(|&c| c != '_')
                    .collect();
                let raw = raw.trim_start_matches('+');
                Expr::parse(raw).map_err(|_| {
                    self.error(
                        span,
                        format!(
                            "the number `{raw}` cannot be used here (write a finite decimal such \
                             as 0.35 or 2e-3, or an expression in quotes)"
                        ),
                    )
                })
            }
        }
    }

    /// Attaches the file position to an expression error.
    pub fn locate(&self, err: Error, span: Range<usize>, text: &str) -> Error {
        let Error::Expression {
            expr,
            column,
            message,
            ..
        } = err
        else {
            return err;
        };
        let raw = &self.text[span.clone()];
        // A basic or literal string on one line whose body is the value.
        let inline = raw.len() >= 2
            && (raw.starts_with('"') || raw.starts_with('\''))
            && !raw.starts_with("\"\"\"")
            && !raw.starts_with("'''")
            && &raw[1..raw.len() - 1] == text;
        let location = match (inline, column) {
            (true, Some(col)) => {
                let byte = text
                    .char_indices()
                    .nth(col - 1)
                    .map(|(b, _)| b)
                    .unwrap_or(text.len());
                self.at(span.start + 1 + byte)
            }
            _ => self.at(span.start),
        };
        Error::Expression {
            location: Some(location),
            expr,
            column,
            message,
        }
    }
}

#[cfg(test)]
mod tests {
    use super::Source;

    #[test]
    fn line_and_column() {
        let s = Source {
            name: "m.toml".into(),
            text: "a = 1\nbθ = \"x\"\n".into(),
        };
        assert_eq!(s.line_col(0), (1, 1));
        assert_eq!(s.line_col(6), (2, 1));
        // after the two-byte θ
        assert_eq!(s.at(9), "m.toml:2:3");
    }
}
