//! `dressing special`: one special function at points and a precision.

use super::{parse_complex, SpecialFn};
use crate::num::ComplexField;
use crate::precision::{Approx, Prec};
use crate::special;
use rug::Complex;
use std::fmt::Write as _;

fn eval_special(
    f: SpecialFn,
    z: &Complex,
    order: u32,
    prec: Prec,
) -> crate::Result<Approx<Complex>> {
    match f {
        SpecialFn::Loggamma => special::log_gamma(z, prec),
        SpecialFn::Gamma => special::gamma(z, prec),
        SpecialFn::Rgamma => special::rgamma(z, prec),
        SpecialFn::Digamma => special::digamma(z, prec),
        SpecialFn::Polygamma => special::polygamma(order, z, prec),
        SpecialFn::Logbarnesg => special::log_barnes_g(z, prec),
        SpecialFn::Barnesg => special::barnes_g(z, prec),
        SpecialFn::Hurwitz => {
            let s = Complex::with_val(z.prec().0, order);
            special::hurwitz_zeta(&s, z, prec)
        }
    }
}

pub(crate) fn special_cmd(
    f: SpecialFn,
    at: &[String],
    digits: u64,
    order: u32,
    json: bool,
) -> Result<String, String> {
    let prec = Prec::digits(digits).map_err(|e| format!("--digits {digits}: {e}"))?;
    let wp = prec.bits() + 32;
    let mut out = String::new();
    let mut rows = Vec::new();
    for text in at {
        let z = parse_complex(text, wp).map_err(|e| format!("--at {text}: {e}"))?;
        let r = eval_special(f, &z, order, prec).map_err(|e| format!("--at {text}: {e}"))?;
        rows.push((text.clone(), r));
    }
    if json {
        out.push_str("[\n");
        for (i, (text, r)) in rows.iter().enumerate() {
            let _ = writeln!(
                out,
                "  {{\"at\": \"{text}\", \"re\": \"{}\", \"im\": \"{}\", \"error_estimate\": \"{}\", \"precision_bits\": {}, \"correct_digits\": {:.1}}}{}",
                r.value.real().to_string_radix(10, Some(digits as usize)),
                r.value.imag().to_string_radix(10, Some(digits as usize)),
                r.radius,
                r.prec,
                r.correct_digits(),
                if i + 1 < rows.len() { "," } else { "" }
            );
        }
        out.push_str("]\n");
    } else {
        for (text, r) in &rows {
            let _ = writeln!(
                out,
                "{:?}({text}) = {}\n    error estimate {}  ({:.1} correct digits, {} bits)",
                f,
                r.value.to_decimal(digits as usize),
                r.radius,
                r.correct_digits(),
                r.prec
            );
        }
    }
    Ok(out)
}
