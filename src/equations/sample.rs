//! Where equations are checked: rectangles of the rapidity plane and a
//! small deterministic generator (SplitMix64), so a run is reproduced by
//! its seed.

use num_complex::Complex64;

/// A closed rectangle `re0 ≤ Re θ ≤ re1`, `im0 ≤ Im θ ≤ im1` (a segment
/// when `im0 = im1`), with a name for reports.
#[derive(Clone, Debug, PartialEq)]
pub struct Region {
    /// Shown in reports.
    pub name: String,
    /// Real range.
    pub re: (f64, f64),
    /// Imaginary range.
    pub im: (f64, f64),
}

impl Region {
    /// Parses `RE0:RE1,IM0:IM1` (e.g. `-2:2,0.1:3`).
    ///
    /// ```
    /// let r = dressing::equations::Region::parse("-2:2,0.1:3").unwrap();
    /// assert_eq!((r.re, r.im), ((-2.0, 2.0), (0.1, 3.0)));
    /// assert!(dressing::equations::Region::parse("1:2").is_err());
    /// ```
    pub fn parse(text: &str) -> Result<Region, String> {
        let bad = || {
            format!("region `{text}`: write RE0:RE1,IM0:IM1 with finite numbers, e.g. -2:2,0.1:3")
        };
        let (re, im) = text.split_once(',').ok_or_else(bad)?;
        let pair = |s: &str| -> Result<(f64, f64), String> {
            let (a, b) = s.split_once(':').ok_or_else(bad)?;
            let (a, b): (f64, f64) = (
                a.trim().parse().map_err(|_| bad())?,
                b.trim().parse().map_err(|_| bad())?,
            );
            if !(a.is_finite() && b.is_finite()) || a > b {
                return Err(bad());
            }
            Ok((a, b))
        };
        Ok(Region {
            name: format!("region {text}"),
            re: pair(re)?,
            im: pair(im)?,
        })
    }
}

/// SplitMix64 (Steele, Lea & Flood 2014): tiny, fast, reproducible.
#[derive(Clone, Debug)]
pub struct Sampler(u64);

impl Sampler {
    /// A generator started from `seed`.
    pub fn new(seed: u64) -> Sampler {
        Sampler(seed)
    }

    fn next_u64(&mut self) -> u64 {
        self.0 = self.0.wrapping_add(0x9E37_79B9_7F4A_7C15);
        let mut z = self.0;
        z = (z ^ (z >> 30)).wrapping_mul(0xBF58_476D_1CE4_E5B9);
        z = (z ^ (z >> 27)).wrapping_mul(0x94D0_49BB_1331_11EB);
        z ^ (z >> 31)
    }

    /// Uniform in [0, 1).
    pub fn uniform(&mut self) -> f64 {
        (self.next_u64() >> 11) as f64 / (1u64 << 53) as f64
    }

    /// A point uniform in the region.
    ///
    /// ```
    /// use dressing::equations::{Region, Sampler};
    /// let r = Region::parse("0:1,2:3").unwrap();
    /// let p = Sampler::new(7).point(&r);
    /// assert!(p.re >= 0.0 && p.re <= 1.0 && p.im >= 2.0 && p.im <= 3.0);
    /// ```
    pub fn point(&mut self, r: &Region) -> Complex64 {
        let x = r.re.0 + (r.re.1 - r.re.0) * self.uniform();
        let y = r.im.0 + (r.im.1 - r.im.0) * self.uniform();
        // Short decimals, so reports can be re-run by hand.
        let round = |v: f64| (v * 1e4).round() / 1e4;
        Complex64::new(round(x), round(y))
    }
}
