//! Parsing complex numbers written naturally: `0.3`, `2.5-0.1i`, `1e-5i`, `-i`.

use rug::{Complex, Float};

/// Parses `text` as a complex number at `prec` bits. Decimal parts are
/// rounded correctly to `prec` bits, so `0.3` means 0.3 to that precision.
///
/// ```
/// let z = dressing::cli::parse_complex("2.5-0.1i", 64).unwrap();
/// assert_eq!(z.real().to_f64(), 2.5);
/// assert_eq!(z.imag().to_f64(), -0.1);
/// assert!(dressing::cli::parse_complex("2.5+", 64).is_err());
/// ```
pub fn parse_complex(text: &str, prec: u32) -> Result<Complex, String> {
    let s: String = text.chars().filter(|c| !c.is_whitespace()).collect();
    if s.is_empty() {
        return Err("empty number; write e.g. 0.3 or 2.5-0.1i".into());
    }
    // Split at the last sign that is not leading and not an exponent sign.
    let bytes = s.as_bytes();
    let mut split = None;
    for i in (1..bytes.len()).rev() {
        let c = bytes[i];
        if (c == b'+' || c == b'-') && !matches!(bytes[i - 1], b'e' | b'E') {
            split = Some(i);
            break;
        }
    }
    let (re_part, im_part) = match split {
        Some(i) if s.ends_with('i') => (&s[..i], &s[i..]),
        Some(_) => {
            return Err(format!(
                "`{text}` is not a number: a two-part number ends in i, e.g. 2.5-0.1i"
            ))
        }
        None if s.ends_with('i') => ("", s.as_str()),
        None => (s.as_str(), ""),
    };
    let re = if re_part.is_empty() {
        Float::new(prec)
    } else {
        real(re_part, prec, text)?
    };
    let im = if im_part.is_empty() {
        Float::new(prec)
    } else {
        let body = &im_part[..im_part.len() - 1];
        match body {
            "" | "+" => Float::with_val(prec, 1),
            "-" => Float::with_val(prec, -1),
            _ => real(body.strip_suffix('*').unwrap_or(body), prec, text)?,
        }
    };
    Ok(Complex::with_val(prec, (re, im)))
}

fn real(s: &str, prec: u32, whole: &str) -> Result<Float, String> {
    let parsed = Float::parse(s).map_err(|_| {
        format!("`{whole}` is not a number: cannot read `{s}`; write e.g. 0.3, -1e-5 or 2.5-0.1i")
    })?;
    let f = Float::with_val(prec, parsed);
    if !f.is_finite() {
        return Err(format!("`{whole}` is not finite"));
    }
    Ok(f)
}

#[cfg(test)]
mod tests {
    use super::parse_complex;

    #[test]
    fn forms() {
        let c = |s: &str| {
            let z = parse_complex(s, 64).unwrap();
            (z.real().to_f64(), z.imag().to_f64())
        };
        assert_eq!(c("0.3"), (0.3, 0.0));
        assert_eq!(c("-2.5+1e-3i"), (-2.5, 1e-3));
        assert_eq!(c("1.5e2-2i"), (150.0, -2.0));
        assert_eq!(c("i"), (0.0, 1.0));
        assert_eq!(c("-i"), (0.0, -1.0));
        assert_eq!(c("3-i"), (3.0, -1.0));
        assert_eq!(c("2e-5i"), (0.0, 2e-5));
        for bad in ["", "abc", "1+2", "1+xi", "nan", "1++2i"] {
            assert!(parse_complex(bad, 64).is_err(), "{bad}");
        }
    }
}
