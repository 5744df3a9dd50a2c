//! From the TOML text to a [`Model`]: parse, check every key, order the
//! parameters, turn each piece's expressions into coefficients (exact where
//! rational) and build the pieces, with errors that name the file, line
//! and column.

use super::factor::{ExpressionPiece, Factor, Piece};
use super::params::{ParamError, Parameters};
use super::schema::{EquationSpec, GammaSpec, ModelFile, PieceSpec, Scalar};
use super::source::Source;
use super::Model;
use crate::equations::{Entry, Equation};
use crate::error::{Error, Result};
use crate::expr::Expr;
use crate::factor::{BarnesFactor, CddBlock, Coef, FiniteGamma, GammaProduct, GammaTerm, Scale};
use rug::{Complex, Float};
use std::collections::BTreeMap;
use std::ops::Range;
use std::sync::Arc;
use toml::Spanned;

/// The piece kinds, as written in `kind = …`.
pub const KINDS: &[&str] = &["gamma-product", "gamma", "barnes", "cdd", "expression"];

/// The accepted forms of `[rapidity] z`, and what they mean.
const SCALES: &[(&str, Scale)] = &[
    ("theta/(i*pi)", Scale::OverIPi),
    ("theta/(2*pi*i)", Scale::Over2PiI),
    ("theta", Scale::Unit),
];

pub(crate) fn build(source: Source, overrides: &[(String, String)]) -> Result<Model> {
    let file: ModelFile = toml::from_str(&source.text).map_err(|e| {
        let loc = match e.span() {
            Some(s) => source.at(s.start),
            None => source.name.clone(),
        };
        Error::Model {
            location: loc,
            message: format!(
                "{} (see docs/model-format.md for the keys a model file may contain)",
                e.message().trim_end()
            ),
        }
    })?;

    // Parameters, with command-line overrides.
    let mut defs: BTreeMap<String, Expr> = BTreeMap::new();
    let mut spans: BTreeMap<String, (Range<usize>, String)> = BTreeMap::new();
    for (name, v) in &file.parameters {
        defs.insert(name.clone(), source.scalar(v)?);
        let text = match v.get_ref() {
            Scalar::Text(s) => s.clone(),
            _ => source.text[v.span()].to_string(),
        };
        spans.insert(name.clone(), (v.span(), text));
    }
    for (name, text) in overrides {
        if !defs.contains_key(name) {
            return Err(Error::Model {
                location: format!("--set {name}={text}"),
                message: format!(
                    "the model has no parameter `{name}`; its parameters are: {}",
                    list(defs.keys())
                ),
            });
        }
        let e = Expr::parse(text).map_err(|e| crate::expr::with_location(e, "--set"))?;
        defs.insert(name.clone(), e);
        spans.remove(name);
    }
    let params = Parameters::new(defs).map_err(
        |ParamError {
             name,
             message,
             inner,
         }| {
            match spans.get(&name) {
                Some((span, text)) => match inner {
                    Some(e) if matches!(*e, Error::Expression { .. }) => {
                        source.locate(*e, span.clone(), text)
                    }
                    _ => source.error(span.clone(), format!("parameter `{name}`: {message}")),
                },
                None => Error::Model {
                    location: format!("--set {name}"),
                    message: message.to_string(),
                },
            }
        },
    )?;
    let params = Arc::new(params);

    // The rapidity variable.
    let (scale, z_text) = match file.rapidity.as_ref().and_then(|r| r.z.as_ref()) {
        None => (Scale::OverIPi, "theta/(i*pi)".to_string()),
        Some(z) => (scale_of(&source, z)?, z.get_ref().clone()),
    };
    let base = match file.rapidity.as_ref().and_then(|r| r.base.as_ref()) {
        None => Expr::parse("0").expect("literal"),
        Some(b) => {
            let e = source.scalar(b)?;
            check_names(&source, b.span(), &e, &params, &[], "the base point")?;
            e
        }
    };

    let mut factors: Vec<Factor> = Vec::new();
    for f in &file.factors {
        let spec = f.get_ref();
        let name = spec.name.get_ref();
        if name.is_empty()
            || !name
                .chars()
                .all(|c| c.is_alphanumeric() || c == '_' || c == '-')
        {
            return Err(source.error(
                spec.name.span(),
                format!("factor name `{name}`: use letters, digits, `_` and `-` only"),
            ));
        }
        if factors.iter().any(|g| g.name == *name) {
            return Err(source.error(
                spec.name.span(),
                format!("a second factor named `{name}`; factor names must be unique"),
            ));
        }
        if spec.pieces.is_empty() {
            return Err(source.error(
                f.span(),
                format!(
                    "factor `{name}` has no pieces; add at least one [[factor.piece]] table \
                     (kinds: {})",
                    KINDS.join(", ")
                ),
            ));
        }
        let mut pieces = Vec::new();
        for p in &spec.pieces {
            pieces.push(build_piece(&source, p, &params, scale)?);
        }
        factors.push(Factor {
            name: name.clone(),
            description: spec.description.clone(),
            pieces,
            base_phase: 0.0,
        });
    }
    if factors.is_empty() {
        return Err(source.file_error(
            "the model defines no factor; add a [[factor]] table with a name and pieces \
             (docs/model-format.md)",
        ));
    }
    let mut equations: Vec<Equation> = Vec::new();
    for e in &file.equations {
        let eq = build_equation(&source, e, &params, &factors)?;
        if equations.iter().any(|q| q.name == eq.name) {
            return Err(source.error(
                e.get_ref().name.span(),
                format!(
                    "a second equation named `{}`; names must be unique",
                    eq.name
                ),
            ));
        }
        equations.push(eq);
    }
    let (name, description) = match &file.model {
        Some(m) => (m.name.clone(), m.description.clone()),
        None => (None, None),
    };
    Model::assemble(
        source,
        name,
        description,
        params,
        scale,
        z_text,
        base,
        factors,
        equations,
        overrides.to_vec(),
    )
}

fn build_equation(
    source: &Source,
    e: &Spanned<EquationSpec>,
    params: &Arc<Parameters>,
    factors: &[Factor],
) -> Result<Equation> {
    let spec = e.get_ref();
    let names: Vec<&str> = factors.iter().map(|f| f.name.as_str()).collect();
    if spec.product.is_empty() {
        return Err(source.error(
            e.span(),
            "an equation needs `product = [ { factor = \"…\", at = \"…\" }, … ]`",
        ));
    }
    let mut entries = Vec::new();
    for p in &spec.product {
        let ps = p.get_ref();
        let f = ps.factor.get_ref();
        if !names.contains(&f.as_str()) {
            return Err(source.error(
                ps.factor.span(),
                format!(
                    "no factor named `{f}`; the factors are: {}",
                    names.join(", ")
                ),
            ));
        }
        let at = source.expr(&ps.at)?;
        check_names(
            source,
            ps.at.span(),
            &at,
            params,
            &["theta"],
            "the argument",
        )?;
        match at.affine_in("theta") {
            Some((_, b)) if !b.to_string().eq("0") => {}
            _ => {
                return Err(source.error(
                    ps.at.span(),
                    format!(
                        "the argument `{at}` must be affine in theta, a + b·theta with b ≠ 0 \
                         (e.g. \"i*pi - theta\")"
                    ),
                ))
            }
        }
        entries.push(Entry {
            factor: f.clone(),
            at,
            power: power(source, ps.power.as_ref())?,
            conjugate: ps.conjugate.unwrap_or(false),
        });
    }
    let rhs = match &spec.equals {
        None => Expr::parse("1").expect("literal"),
        Some(v) => {
            let r = source.scalar(v)?;
            for v2 in r.free_variables() {
                if v2 != "theta" && v2 != "z" && params.definition(&v2).is_none() {
                    return Err(source.error(
                        v.span(),
                        format!("the right-hand side uses `{v2}`, which is not defined"),
                    ));
                }
            }
            for f in r.user_functions() {
                if !names.contains(&f.as_str()) {
                    return Err(source.error(
                        v.span(),
                        format!(
                            "the right-hand side calls `{f}(…)`, which is neither a built-in \
                             nor a factor of the model (factors: {})",
                            names.join(", ")
                        ),
                    ));
                }
            }
            r
        }
    };
    Ok(Equation {
        name: spec.name.get_ref().clone(),
        description: spec.description.clone(),
        entries,
        rhs,
    })
}

fn list<'a>(names: impl Iterator<Item = &'a String>) -> String {
    let v: Vec<&str> = names.map(|s| s.as_str()).collect();
    if v.is_empty() {
        "(none)".into()
    } else {
        v.join(", ")
    }
}

fn scale_of(source: &Source, z: &Spanned<String>) -> Result<Scale> {
    let e = source.expr(z)?;
    let want = Expr::parse;
    for (text, scale) in SCALES {
        let w = want(text).expect("literal");
        if same_value(&e, &w) {
            return Ok(*scale);
        }
    }
    Err(source.error(
        z.span(),
        format!(
            "z = \"{}\" is not one of the supported variables; write one of {}",
            z.get_ref(),
            SCALES
                .iter()
                .map(|(t, _)| format!("\"{t}\""))
                .collect::<Vec<_>>()
                .join(", ")
        ),
    ))
}

/// Whether two expressions in θ alone agree at two test points.
fn same_value(a: &Expr, b: &Expr) -> bool {
    if a.free_variables().iter().any(|v| v != "theta") {
        return false;
    }
    [(0.3, 0.7), (-1.1, 0.2)].iter().all(|&(x, y)| {
        let env = [("theta", Complex::with_val(128, (x, y)))];
        match (
            a.eval::<Complex, _>(&env, 128),
            b.eval::<Complex, _>(&env, 128),
        ) {
            (Ok(u), Ok(v)) => {
                let d = Complex::with_val(128, &u - &v);
                d.abs().real().to_f64() < 1e-30
            }
            _ => false,
        }
    })
}

/// Every name in `e` must be a parameter or one of `vars`.
fn check_names(
    source: &Source,
    span: Range<usize>,
    e: &Expr,
    params: &Parameters,
    vars: &[&str],
    what: &str,
) -> Result<()> {
    for v in e.free_variables() {
        if vars.contains(&v.as_str()) || params.definition(&v).is_some() {
            continue;
        }
        let hint = if v == "theta" && vars.contains(&"z") {
            "; gamma arguments are written in z (see `z` in [rapidity])".to_string()
        } else {
            let mut known: Vec<String> = params.names().map(String::from).collect();
            known.extend(vars.iter().map(|s| s.to_string()));
            format!("; known names: {}", list(known.iter()))
        };
        return Err(source.error(
            span,
            format!("{what} uses `{v}`, which is not defined{hint}"),
        ));
    }
    if let Some(f) = e.user_functions().into_iter().next() {
        return Err(source.error(
            span,
            format!("{what} calls `{f}(…)`, which is not a built-in function"),
        ));
    }
    Ok(())
}

/// A real coefficient from an expression in the parameters: exact when
/// rational, otherwise recomputed at each precision.
fn coef(source: &Source, span: Range<usize>, e: &Expr, params: &Arc<Parameters>) -> Result<Coef> {
    check_names(source, span.clone(), e, params, &[], "a coefficient")?;
    if let Some(q) = e.to_rational(|n| params.exact(n).cloned()) {
        return Ok(Coef::from_rational(q));
    }
    let vals = params.at(128)?;
    let v: Complex = e
        .eval(&**vals, 128)
        .map_err(|err| source.error(span.clone(), format!("`{e}`: {err}")))?;
    let (re, im) = (v.real().to_f64(), v.imag().to_f64());
    if !(re.is_finite() && im.is_finite()) || im.abs() > 1e-30 * re.abs().max(1.0) {
        return Err(source.error(
            span,
            format!(
                "the coefficient `{e}` must be real, but it is {}; the gamma pieces need real \
                 steps, offsets and slopes",
                v.to_string_radix(10, Some(12))
            ),
        ));
    }
    let (e, p) = (e.clone(), Arc::clone(params));
    Ok(Coef::computed(&e.to_string(), move |prec| {
        match p
            .at(prec)
            .and_then(|vals| e.eval::<Complex, _>(&**vals, prec))
        {
            Ok(v) => Float::with_val(prec, v.real()),
            Err(_) => Float::with_val(prec, f64::NAN),
        }
    }))
}

/// The keys a piece of each kind may use.
fn allowed(kind: &str) -> &'static [&'static str] {
    match kind {
        "gamma-product" => &["gammas", "normalise-at"],
        "gamma" | "barnes" => &["gammas"],
        "cdd" => &["blocks"],
        _ => &["value", "log"],
    }
}

fn build_piece(
    source: &Source,
    p: &Spanned<PieceSpec>,
    params: &Arc<Parameters>,
    scale: Scale,
) -> Result<Piece> {
    let spec = p.get_ref();
    let kind = spec.kind.get_ref().as_str();
    if !KINDS.contains(&kind) {
        return Err(source.error(
            spec.kind.span(),
            format!(
                "unknown piece kind `{kind}`; the kinds are: {}",
                KINDS.join(", ")
            ),
        ));
    }
    let present = [
        ("gammas", spec.gammas.is_some()),
        ("normalise-at", spec.normalise_at.is_some()),
        ("blocks", spec.blocks.is_some()),
        ("value", spec.value.is_some()),
        ("log", spec.log.is_some()),
    ];
    for (key, there) in present {
        if there && !allowed(kind).contains(&key) {
            return Err(source.error(
                p.span(),
                format!(
                    "key `{key}` does not belong in a piece of kind `{kind}`, which takes: {}",
                    allowed(kind).join(", ")
                ),
            ));
        }
    }
    let here = |e: Error| match e {
        e @ (Error::Model { .. } | Error::Expression { .. }) => e,
        other => source.error(p.span(), format!("piece of kind `{kind}`: {other}")),
    };
    match kind {
        "gamma-product" | "gamma" | "barnes" => {
            let gammas = match &spec.gammas {
                Some(g) if !g.is_empty() => g,
                _ => {
                    return Err(source.error(
                        p.span(),
                        format!(
                            "a piece of kind `{kind}` needs `gammas = [ {{ arg = \"…\", power = n }}, … ]`"
                        ),
                    ))
                }
            };
            let infinite = kind == "gamma-product";
            let mut terms = Vec::new();
            for g in gammas {
                terms.push(gamma_term(source, g, params, infinite)?);
            }
            match kind {
                "gamma-product" => {
                    let normalise = match &spec.normalise_at {
                        None => None,
                        Some(v) => {
                            let e = source.scalar(v)?;
                            check_names(source, v.span(), &e, params, &[], "normalise-at")?;
                            let vals = params.at(128)?;
                            let t: Complex = e
                                .eval(&**vals, 128)
                                .map_err(|err| source.error(v.span(), err.to_string()))?;
                            Some((t.real().to_f64(), t.imag().to_f64()))
                        }
                    };
                    let terms = terms
                        .into_iter()
                        .map(|(a, b, s, n)| GammaTerm::new(a, b, s, n))
                        .collect();
                    GammaProduct::new(terms, scale, normalise)
                        .map(|g| Piece::Product(Box::new(g)))
                        .map_err(here)
                }
                "gamma" => {
                    let terms = terms.into_iter().map(|(_, b, s, n)| (b, s, n)).collect();
                    FiniteGamma::new(terms, scale)
                        .map(Piece::Gamma)
                        .map_err(here)
                }
                _ => {
                    let terms = terms.into_iter().map(|(_, b, s, n)| (b, s, n)).collect();
                    BarnesFactor::new(terms, scale)
                        .map(Piece::Barnes)
                        .map_err(here)
                }
            }
        }
        "cdd" => {
            let blocks = match &spec.blocks {
                Some(b) if !b.is_empty() => b,
                _ => return Err(source.error(
                    p.span(),
                    "a piece of kind `cdd` needs `blocks = [ { alpha = \"…\", power = n }, … ]`",
                )),
            };
            let mut out = Vec::new();
            for b in blocks {
                let spec = b.get_ref();
                let e = source.scalar(&spec.alpha)?;
                let a = coef(source, spec.alpha.span(), &e, params)?;
                out.push((a, power(source, spec.power.as_ref())?));
            }
            CddBlock::new(out).map(Piece::Cdd).map_err(here)
        }
        _ => {
            let (text, is_log) =
                match (&spec.value, &spec.log) {
                    (Some(v), None) => (v, false),
                    (None, Some(l)) => (l, true),
                    _ => return Err(source.error(
                        p.span(),
                        "a piece of kind `expression` needs exactly one of `value = \"…\"` (the \
                         factor) or `log = \"…\"` (its logarithm)",
                    )),
                };
            let e = source.expr(text)?;
            check_names(
                source,
                text.span(),
                &e,
                params,
                &["theta", "z"],
                "the expression",
            )?;
            Ok(Piece::Expression(ExpressionPiece {
                expr: e,
                is_log,
                params: Arc::clone(params),
                scale,
                derivative: Default::default(),
            }))
        }
    }
}

fn power(source: &Source, p: Option<&Spanned<i64>>) -> Result<i64> {
    match p {
        None => Ok(1),
        Some(p) if *p.get_ref() == 0 || p.get_ref().unsigned_abs() > 1_000_000 => Err(source
            .error(
                p.span(),
                "a power must be a non-zero integer (at most 10⁶ in size); drop the entry \
                 instead of giving it power 0",
            )),
        Some(p) => Ok(*p.get_ref()),
    }
}

type Term = (Coef, Coef, Coef, i64);

/// (step, offset, slope, power) of one gamma, from `arg = "a*k + b + s*z"`
/// or from `step`, `offset`, `slope`.
fn gamma_term(
    source: &Source,
    g: &Spanned<GammaSpec>,
    params: &Arc<Parameters>,
    infinite: bool,
) -> Result<Term> {
    let spec = g.get_ref();
    let n = power(source, spec.power.as_ref())?;
    let explicit = [&spec.step, &spec.offset, &spec.slope];
    match &spec.arg {
        Some(arg) => {
            if explicit.iter().any(|x| x.is_some()) {
                return Err(source.error(
                    g.span(),
                    "give either `arg` or `step`/`offset`/`slope`, not both",
                ));
            }
            let e = source.expr(arg)?;
            let vars: &[&str] = if infinite { &["k", "z"] } else { &["z"] };
            check_names(source, arg.span(), &e, params, vars, "the argument")?;
            let shape = if infinite {
                "a·k + b + s·z (a > 0; a, b, s in the parameters)"
            } else {
                "b + s·z (b, s in the parameters)"
            };
            let not_affine = || {
                source.error(
                    arg.span(),
                    format!("the argument `{e}` must have the form {shape}"),
                )
            };
            let (rest, step) = e.affine_in("k").ok_or_else(not_affine)?;
            if step.depends_on("z") {
                return Err(not_affine());
            }
            let (offset, slope) = rest.affine_in("z").ok_or_else(not_affine)?;
            let span = arg.span();
            let step = coef(source, span.clone(), &step, params)?;
            if infinite && step.value(64) <= 0 {
                return Err(source.error(
                    span,
                    format!(
                        "the step (the coefficient of k in `{e}`) is {}; it must be positive",
                        step.label()
                    ),
                ));
            }
            Ok((
                step,
                coef(source, span.clone(), &offset, params)?,
                coef(source, span, &slope, params)?,
                n,
            ))
        }
        None => {
            let get = |x: &Option<Spanned<Scalar>>,
                       key: &str,
                       default: Option<&str>|
             -> Result<Coef> {
                match x {
                    Some(v) => coef(source, v.span(), &source.scalar(v)?, params),
                    None => match default {
                        Some(d) => Ok(Coef::from_rational(
                            Expr::parse(d)
                                .ok()
                                .and_then(|e| e.to_rational(|_| None))
                                .unwrap_or_default(),
                        )),
                        None => Err(source.error(
                            g.span(),
                            format!("missing `{key}`: give `arg = \"…\"`, or `step`, `offset` and `slope`"),
                        )),
                    },
                }
            };
            if !infinite && spec.step.is_some() {
                return Err(source.error(
                    g.span(),
                    "a finite gamma or Barnes factor has no `step` (there is no product index k)",
                ));
            }
            let step = if infinite {
                get(&spec.step, "step", None)?
            } else {
                Coef::integer(0)
            };
            Ok((
                step,
                get(&spec.offset, "offset", Some("0"))?,
                get(&spec.slope, "slope", Some("0"))?,
                n,
            ))
        }
    }
}
