//! Named parameters (couplings): numbers, or expressions of other
//! parameters. Definitions are ordered by dependency at load time (cycles
//! and undefined names are errors naming the parameters involved), kept
//! exact where they are rational, and evaluated at whatever working
//! precision a computation asks for, with the values cached per precision.

use crate::error::{Error, Result};
use crate::expr::{Builtin, Expr};
use rug::{Complex, Rational};
use std::collections::{BTreeMap, HashMap};
use std::sync::{Arc, RwLock};

/// Names a parameter may not take: the constants and variables of the
/// expression language and of model files.
pub const RESERVED: &[&str] = &["i", "pi", "theta", "z", "k"];

/// Parameter values at one working precision.
pub type Values = Arc<Vec<(String, Complex)>>;

/// The parameters of a model, in dependency order.
#[derive(Debug)]
pub struct Parameters {
    /// (name, definition) in evaluation order.
    order: Vec<(String, Expr)>,
    /// Exact values of the rational ones.
    exact: HashMap<String, Rational>,
    cache: RwLock<HashMap<u32, Values>>,
}

impl Clone for Parameters {
    fn clone(&self) -> Self {
        Parameters {
            order: self.order.clone(),
            exact: self.exact.clone(),
            cache: RwLock::new(HashMap::new()),
        }
    }
}

/// Why a set of definitions was rejected, with the parameter at fault.
#[derive(Debug)]
pub(crate) struct ParamError {
    pub name: String,
    pub message: String,
    /// An expression error to pass on (with its column), when there is one.
    pub inner: Option<Box<Error>>,
}

impl Parameters {
    /// Orders `defs` by dependency and evaluates them once (at 128 bits) to
    /// catch errors at load time.
    pub(crate) fn new(defs: BTreeMap<String, Expr>) -> std::result::Result<Self, ParamError> {
        for name in defs.keys() {
            if RESERVED.contains(&name.as_str()) || Builtin::from_name(name).is_some() {
                return Err(ParamError {
                    name: name.clone(),
                    message: format!(
                        "`{name}` is reserved (the constants i and pi, the variables theta, z \
                         and k, and the built-in functions); rename the parameter"
                    ),
                    inner: None,
                });
            }
        }
        let mut order = Vec::new();
        let mut state: HashMap<&str, u8> = HashMap::new(); // 1 visiting, 2 done
        fn visit<'a>(
            name: &'a str,
            defs: &'a BTreeMap<String, Expr>,
            state: &mut HashMap<&'a str, u8>,
            stack: &mut Vec<&'a str>,
            order: &mut Vec<(String, Expr)>,
        ) -> std::result::Result<(), ParamError> {
            match state.get(name) {
                Some(2) => return Ok(()),
                Some(1) => {
                    let start = stack.iter().position(|n| *n == name).unwrap_or(0);
                    let mut cycle: Vec<&str> = stack[start..].to_vec();
                    cycle.push(name);
                    return Err(ParamError {
                        name: name.to_string(),
                        message: format!(
                            "circular definition: {}; define one of them by a number",
                            cycle.join(" → ")
                        ),
                        inner: None,
                    });
                }
                _ => {}
            }
            state.insert(name, 1);
            stack.push(name);
            let e = &defs[name];
            if let Some(f) = e.user_functions().into_iter().next() {
                return Err(ParamError {
                    name: name.to_string(),
                    message: format!(
                        "`{f}(…)` is not a built-in function; parameters may use the built-ins \
                         only"
                    ),
                    inner: None,
                });
            }
            for dep in e.free_variables() {
                if dep == "theta" || dep == "z" || dep == "k" {
                    return Err(ParamError {
                        name: name.to_string(),
                        message: format!(
                            "a parameter cannot depend on the variable `{dep}`; parameters are \
                             constants"
                        ),
                        inner: None,
                    });
                }
                if !defs.contains_key(&dep) {
                    let known: Vec<&str> = defs.keys().map(|s| s.as_str()).collect();
                    return Err(ParamError {
                        name: name.to_string(),
                        message: format!(
                            "uses `{dep}`, which is not defined; the parameters are: {}",
                            if known.is_empty() {
                                "(none)".to_string()
                            } else {
                                known.join(", ")
                            }
                        ),
                        inner: None,
                    });
                }
                let dep = defs.get_key_value(&dep).map(|(k, _)| k.as_str()).unwrap();
                visit(dep, defs, state, stack, order)?;
            }
            stack.pop();
            state.insert(name, 2);
            order.push((name.to_string(), e.clone()));
            Ok(())
        }
        for name in defs.keys() {
            visit(name, &defs, &mut state, &mut Vec::new(), &mut order)?;
        }
        let mut exact = HashMap::new();
        for (name, e) in &order {
            if let Some(q) = e.to_rational(|n| exact.get(n).cloned()) {
                exact.insert(name.clone(), q);
            }
        }
        let p = Parameters {
            order,
            exact,
            cache: RwLock::new(HashMap::new()),
        };
        p.values(128).map_err(|(name, e)| ParamError {
            name,
            message: e.to_string(),
            inner: Some(Box::new(e)),
        })?;
        Ok(p)
    }

    /// The names, in dependency order.
    pub fn names(&self) -> impl Iterator<Item = &str> {
        self.order.iter().map(|(n, _)| n.as_str())
    }

    /// The definition of `name`.
    pub fn definition(&self, name: &str) -> Option<&Expr> {
        self.order.iter().find(|(n, _)| n == name).map(|(_, e)| e)
    }

    /// The exact value of `name`, when it is rational.
    pub fn exact(&self, name: &str) -> Option<&Rational> {
        self.exact.get(name)
    }

    /// Every parameter at `wp` bits, cached. Errors name the parameter.
    pub(crate) fn values(&self, wp: u32) -> std::result::Result<Values, (String, Error)> {
        if let Some(v) = self.cache.read().expect("poisoned").get(&wp) {
            return Ok(Arc::clone(v));
        }
        let mut vals: Vec<(String, Complex)> = Vec::with_capacity(self.order.len());
        for (name, e) in &self.order {
            let v: Complex = match self.exact.get(name) {
                Some(q) => Complex::with_val(wp, q),
                None => e.eval(&vals, wp).map_err(|err| (name.clone(), err))?,
            };
            vals.push((name.clone(), v));
        }
        let vals = Arc::new(vals);
        let mut cache = self.cache.write().expect("poisoned");
        if cache.len() > 64 {
            cache.clear();
        }
        cache.insert(wp, Arc::clone(&vals));
        Ok(vals)
    }

    /// The names an expression may use at a rapidity: every parameter at
    /// `wp` bits, `theta`, and the pieces' variable `z`, on either path.
    pub(crate) fn bindings<C: crate::num::ComplexField>(
        &self,
        wp: u32,
        theta: &C,
        scale: crate::factor::Scale,
    ) -> Result<Vec<(String, C)>> {
        let vals = self.at(wp)?;
        let th = theta.with_prec(wp);
        let mut env: Vec<(String, C)> = vals
            .iter()
            .map(|(n, v)| (n.clone(), super::factor::from_rug::<C>(v, wp)))
            .collect();
        env.push(("z".into(), scale.z_of(&th)));
        env.push(("theta".into(), th));
        Ok(env)
    }

    /// Every parameter at `wp` bits, as a crate error.
    pub fn at(&self, wp: u32) -> Result<Values> {
        self.values(wp).map_err(|(name, e)| Error::Domain {
            function: "model parameters",
            message: format!("parameter `{name}`: {e}"),
        })
    }
}
