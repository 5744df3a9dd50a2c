//! Testing CDD candidates: homogeneous equations, poles added with their
//! residue signs, edge behaviour; exact enumeration against the argument
//! principle.

use dressing::equations::{analyse_cdd, CheckOptions};
use dressing::model::Model;

fn lantern() -> Model {
    Model::load(concat!(
        env!("CARGO_MANIFEST_DIR"),
        "/examples/lantern.toml"
    ))
    .unwrap()
}

/// A model whose factor is 1, so the residues are the candidate's own.
fn trivial() -> Model {
    Model::from_toml(
        r#"
[[factor]]
name = "one"
[[factor.piece]]
kind = "expression"
value = "1"
[[equation]]
name = "unitarity"
product = [ { factor = "one", at = "theta" }, { factor = "one", at = "-theta" } ]
[[equation]]
name = "crossing"
product = [ { factor = "one", at = "i*pi - theta" }, { factor = "one", at = "theta", power = -1 } ]
"#,
        "trivial.toml",
    )
    .unwrap()
}

/// The E8 S-matrix of the Ising model in a magnetic field (A. B.
/// Zamolodchikov, Int. J. Mod. Phys. A 4 (1989) 4235), S₁₁ = f_{2/3} f_{2/5} f_{1/15}:
/// simple poles at θ = 2πi/3, 2πi/5, iπ/15 with −i·Res > 0 (the bound
/// states m₁, m₂, m₃) and their crossed images 1/3, 3/5, 14/15 with −i·Res < 0.
/// Recalled from memory; both the enumeration and the residues are ours.
#[test]
fn e8_s11_poles_and_residue_signs() {
    let m = trivial();
    let r = analyse_cdd(
        &m,
        "one",
        "block(2/3)*block(2/5)*block(1/15)",
        &CheckOptions::new(20).unwrap(),
    )
    .unwrap();
    assert!(r.equations.iter().all(|e| e.passed));
    let got: Vec<(String, i64, f64)> = r
        .added
        .iter()
        .map(|a| {
            (
                a.exact.as_ref().unwrap().to_string(),
                a.dressed_order,
                a.neg_i_residue.unwrap().0.re,
            )
        })
        .collect();
    let want = [
        ("1/15", 1.0),
        ("1/3", -1.0),
        ("2/5", 1.0),
        ("3/5", -1.0),
        ("2/3", 1.0),
        ("14/15", -1.0),
    ];
    assert_eq!(got.len(), 6, "{got:?}");
    for (u, sign) in want {
        let g = got
            .iter()
            .find(|g| g.0 == u)
            .unwrap_or_else(|| panic!("{u}: {got:?}"));
        assert_eq!(g.1, 1);
        assert!(g.2 * sign > 0.0, "{u}: {}", g.2);
    }
    // S₁₁(0) = −1 for the E8 factor (each block is −1 at θ = 0).
    assert!((r.at_zero.unwrap() + 1.0).norm() < 1e-12);
}

/// Enumeration (exact, from the blocks) and discovery (scan + argument
/// principle on the written-out expression) find the same points with the
/// same residues: two independent methods.
#[test]
fn enumeration_and_argument_principle_agree() {
    let m = lantern();
    let opts = CheckOptions::new(20).unwrap();
    let a = analyse_cdd(&m, "sigma", "block(0.3)", &opts).unwrap();
    let b = analyse_cdd(
        &m,
        "sigma",
        "(sinh(theta) + i*sin(pi*0.3))/(sinh(theta) - i*sin(pi*0.3))",
        &opts,
    )
    .unwrap();
    assert!(a.located_by.starts_with("exact") && b.located_by.starts_with("scan"));
    assert_eq!(a.added.len(), 2);
    assert_eq!(a.added.len(), b.added.len());
    for (x, y) in a.added.iter().zip(&b.added) {
        assert!(
            (x.u_over_pi - y.u_over_pi).abs() < 1e-6,
            "{} {}",
            x.u_over_pi,
            y.u_over_pi
        );
        assert_eq!(x.order, y.order);
        let (rx, ry) = (x.neg_i_residue.unwrap().0, y.neg_i_residue.unwrap().0);
        assert!((rx - ry).norm() < 1e-6 * rx.norm(), "{rx} {ry}");
    }
    assert!((a.phase_change.unwrap() - b.phase_change.unwrap()).abs() < 1e-9);
}

/// The sinh-Gordon S-matrix (Arinshtein, Fateev & Zamolodchikov 1979) as a
/// CDD candidate, S = (sinh θ − i sin(πB/2))/(sinh θ + i sin(πB/2)) = f_{−B/2}:
/// it keeps the equations and adds no pole to the physical strip (its
/// poles are on the unphysical sheet; it adds zeros there).
#[test]
fn sinh_gordon_candidate_adds_no_physical_pole() {
    let m = lantern();
    let r = analyse_cdd(&m, "sigma", "block(-0.3)", &CheckOptions::new(25).unwrap()).unwrap();
    assert!(r.equations.iter().all(|e| e.passed), "{:?}", r.equations);
    assert!(!r.added.is_empty());
    assert!(r.added.iter().all(|a| a.order < 0), "{:?}", r.added);
    // |S| = 1 on the real line, S → 1 at ±∞, S(0) = −1.
    assert!((r.limits.1.unwrap() - 1.0).norm() < 1e-12);
    assert!((r.at_zero.unwrap() + 1.0).norm() < 1e-12);
}

#[test]
fn a_candidate_that_breaks_crossing_is_reported() {
    let m = lantern();
    let r = analyse_cdd(&m, "sigma", "exp(theta)", &CheckOptions::new(20).unwrap()).unwrap();
    let kept: Vec<(&str, bool)> = r
        .equations
        .iter()
        .map(|e| (e.name.as_str(), e.passed))
        .collect();
    assert!(
        kept.contains(&("unitarity (homogeneous)", true)),
        "{kept:?}"
    );
    assert!(
        kept.contains(&("crossing (homogeneous)", false)),
        "{kept:?}"
    );
    assert!(
        kept.contains(&("real-analyticity (homogeneous)", false)),
        "{kept:?}"
    );
}

#[test]
fn bad_candidates_are_clear_errors() {
    let m = lantern();
    let o = CheckOptions::new(20).unwrap();
    let e = analyse_cdd(&m, "sigma", "block(1/3) +", &o)
        .unwrap_err()
        .to_string();
    assert!(e.contains('^'), "{e}");
    let e = analyse_cdd(&m, "sigma", "block(1/3) + 1", &o)
        .unwrap_err()
        .to_string();
    assert!(e.contains("product of blocks"), "{e}");
    let e = analyse_cdd(&m, "sigma", "q*theta", &o)
        .unwrap_err()
        .to_string();
    assert!(e.contains("`q`"), "{e}");
    let e = analyse_cdd(&m, "nope", "block(1/3)", &o)
        .unwrap_err()
        .to_string();
    assert!(e.contains("no factor named"), "{e}");
}

#[test]
fn a_candidate_must_be_a_function_of_theta_alone() {
    let m = lantern();
    let e = analyse_cdd(&m, "sigma", "exp(k*theta)", &CheckOptions::new(20).unwrap())
        .unwrap_err()
        .to_string();
    assert!(e.contains("`k`"), "{e}");
}
