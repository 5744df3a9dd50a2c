//! The TOML schema of model files, as read by serde. Every table rejects
//! unknown keys; every expression keeps its span so errors can point at the
//! file, line and column. The meaning of each key is in docs/model-format.md.

use serde::Deserialize;
use std::collections::BTreeMap;
use toml::Spanned;

/// A whole model file.
#[derive(Deserialize, Debug)]
#[serde(deny_unknown_fields)]
pub(crate) struct ModelFile {
    pub model: Option<Meta>,
    pub rapidity: Option<Rapidity>,
    #[serde(default)]
    pub parameters: BTreeMap<String, Spanned<Scalar>>,
    #[serde(default, rename = "factor")]
    pub factors: Vec<Spanned<FactorSpec>>,
    #[serde(default, rename = "equation")]
    pub equations: Vec<Spanned<EquationSpec>>,
}

/// `[[equation]]`: `Π product = equals`.
#[derive(Deserialize, Debug)]
#[serde(deny_unknown_fields)]
pub(crate) struct EquationSpec {
    pub name: Spanned<String>,
    pub description: Option<String>,
    pub product: Vec<Spanned<EntrySpec>>,
    pub equals: Option<Spanned<Scalar>>,
}

/// One entry of an equation's product: `factor(at)^power`.
#[derive(Deserialize, Debug)]
#[serde(deny_unknown_fields)]
pub(crate) struct EntrySpec {
    pub factor: Spanned<String>,
    pub at: Spanned<String>,
    pub power: Option<Spanned<i64>>,
    pub conjugate: Option<bool>,
}

/// `[model]`: descriptive only.
#[derive(Deserialize, Debug)]
#[serde(deny_unknown_fields)]
pub(crate) struct Meta {
    pub name: Option<String>,
    pub description: Option<String>,
}

/// `[rapidity]`: how the pieces' variable z depends on θ, and where the
/// continuous branch of log S starts.
#[derive(Deserialize, Debug)]
#[serde(deny_unknown_fields)]
pub(crate) struct Rapidity {
    pub z: Option<Spanned<String>>,
    pub base: Option<Spanned<Scalar>>,
}

/// A number or an expression in a string. Numbers are re-read from the
/// file's text so that `0.35` stays the exact decimal 7/20.
#[derive(Deserialize, Debug, Clone)]
#[serde(untagged)]
#[allow(dead_code)] // the numbers' values are re-read from the text
pub(crate) enum Scalar {
    Integer(i64),
    Float(f64),
    Text(String),
}

/// `[[factor]]`.
#[derive(Deserialize, Debug)]
#[serde(deny_unknown_fields)]
pub(crate) struct FactorSpec {
    pub name: Spanned<String>,
    pub description: Option<String>,
    #[serde(default, rename = "piece")]
    pub pieces: Vec<Spanned<PieceSpec>>,
}

/// `[[factor.piece]]`: one table for every kind, checked per kind when the
/// model is built (so that the messages can say which key belongs where).
#[derive(Deserialize, Debug)]
#[serde(deny_unknown_fields, rename_all = "kebab-case")]
pub(crate) struct PieceSpec {
    pub kind: Spanned<String>,
    pub gammas: Option<Vec<Spanned<GammaSpec>>>,
    pub normalise_at: Option<Spanned<Scalar>>,
    pub blocks: Option<Vec<Spanned<BlockSpec>>>,
    pub value: Option<Spanned<String>>,
    pub log: Option<Spanned<String>>,
}

/// One gamma (or Barnes G) function: either its argument written out, or
/// its coefficients.
#[derive(Deserialize, Debug)]
#[serde(deny_unknown_fields)]
pub(crate) struct GammaSpec {
    pub arg: Option<Spanned<String>>,
    pub step: Option<Spanned<Scalar>>,
    pub offset: Option<Spanned<Scalar>>,
    pub slope: Option<Spanned<Scalar>>,
    pub power: Option<Spanned<i64>>,
}

/// One CDD block `f_α(θ)^power`.
#[derive(Deserialize, Debug)]
#[serde(deny_unknown_fields)]
pub(crate) struct BlockSpec {
    pub alpha: Spanned<Scalar>,
    pub power: Option<Spanned<i64>>,
}
