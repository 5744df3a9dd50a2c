//! Plots: each kind writes a valid SVG or PNG file for examples/lantern.toml;
//! the phase portrait's colours follow arg S and log|S|; bad input gives
//! errors, not panics.

use dressing::cli::{run, Cli};
use dressing::factor::Method;
use dressing::model::Model;
use dressing::plot::{
    axis_plot, colour_of, lightness, phase_grid, phase_portrait, real_line_plot, Mark, MarkKind,
    NEUTRAL,
};
use dressing::{Error, Prec};
use num_complex::Complex64;
use std::f64::consts::PI;
use std::path::{Path, PathBuf};

const PNG: &[u8] = b"\x89PNG\r\n\x1a\n";

fn lantern() -> Model {
    Model::load("examples/lantern.toml").unwrap()
}

fn tmp(name: &str) -> PathBuf {
    let dir = std::env::temp_dir().join("dressing-plot-tests");
    std::fs::create_dir_all(&dir).unwrap();
    dir.join(name)
}

fn assert_svg(path: &Path, title: &str) {
    let text = std::fs::read_to_string(path).unwrap();
    assert!(
        text.len() > 1000,
        "{} is only {} bytes",
        path.display(),
        text.len()
    );
    let head = text.trim_start();
    assert!(
        head.starts_with("<svg") || head.starts_with("<?xml"),
        "{head:.60}"
    );
    assert!(text.trim_end().ends_with("</svg>"));
    assert!(
        text.contains(title),
        "{} lacks the title `{title}`",
        path.display()
    );
    // Balanced elements, roughly: every opened tag is closed or self-closing.
    let opens = text.matches('<').count();
    let closes = text.matches('>').count();
    assert_eq!(opens, closes);
}

fn assert_png(path: &Path, size: (u32, u32)) {
    let bytes = std::fs::read(path).unwrap();
    assert!(bytes.len() > 1000);
    assert_eq!(&bytes[..8], PNG);
    let img = image::load_from_memory(&bytes).unwrap();
    assert_eq!((img.width(), img.height()), size);
}

fn pole() -> Mark {
    Mark {
        theta: (0.0, PI / 3.0),
        kind: MarkKind::Pole,
        order: 1,
        label: "iπ/3".into(),
    }
}

#[test]
fn strip_writes_svg_and_png() {
    let m = lantern();
    let marks = [
        pole(),
        Mark {
            theta: (0.5, 2.0),
            kind: MarkKind::Zero,
            order: 2,
            label: String::new(),
        },
    ];
    let out = tmp("strip.svg");
    let w = phase_portrait(
        &m,
        "sigma",
        (-3.0, 3.0),
        (-0.5, PI + 0.5),
        (240, 180),
        &marks,
        &out,
    )
    .unwrap();
    assert_eq!(w, out);
    assert_svg(&out, "phase portrait of sigma (lantern)");
    let svg = std::fs::read_to_string(&out).unwrap();
    assert!(
        svg.contains("data:image/png;base64,"),
        "the portrait is embedded"
    );
    assert!(svg.contains("Im θ = π") && svg.contains("pole") && svg.contains("zero"));
    assert!(svg.contains("order 2") && svg.contains("iπ/3"));
    let out = tmp("strip.png");
    phase_portrait(
        &m,
        "sigma",
        (-3.0, 3.0),
        (-0.5, PI + 0.5),
        (240, 180),
        &marks,
        &out,
    )
    .unwrap();
    assert_png(&out, (240, 180));
}

#[test]
fn real_and_axis_write_svg_and_png() {
    let m = lantern();
    let out = tmp("real.svg");
    real_line_plot(&m, "sigma", (-6.0, 6.0), (300, 240), Prec::DOUBLE, &out).unwrap();
    assert_svg(&out, "sigma (lantern) on the real line");
    let svg = std::fs::read_to_string(&out).unwrap();
    assert!(svg.contains("|S|") && svg.contains("δ(θ)"));
    let out = tmp("real.png");
    real_line_plot(&m, "dressed", (-6.0, 6.0), (300, 240), Prec::DOUBLE, &out).unwrap();
    assert_png(&out, (300, 240));
    // The MPFR path.
    let out = tmp("real30.svg");
    real_line_plot(
        &m,
        "lamp",
        (-2.0, 2.0),
        (200, 160),
        Prec::digits(30).unwrap(),
        &out,
    )
    .unwrap();
    assert_svg(&out, "lamp (lantern) on the real line");

    let out = tmp("axis.svg");
    axis_plot(
        &m,
        "sigma",
        (0.0, PI),
        (300, 240),
        Prec::DOUBLE,
        &[pole()],
        &out,
    )
    .unwrap();
    assert_svg(&out, "sigma (lantern) on the imaginary axis");
    assert!(std::fs::read_to_string(&out).unwrap().contains("log|S|"));
    let out = tmp("axis.png");
    axis_plot(
        &m,
        "dressed",
        (0.0, PI),
        (300, 240),
        Prec::DOUBLE,
        &[pole()],
        &out,
    )
    .unwrap();
    assert_png(&out, (300, 240));
}

#[test]
fn hue_tracks_the_phase_and_lightness_the_modulus() {
    // Phases 0, 2π/3, 4π/3 at |S| = 1: red, green, blue.
    let c = |re: f64, im: f64| colour_of(Complex64::new(re, im));
    let dominant = |rgb: [u8; 3]| (0..3).max_by_key(|&k| rgb[k]).unwrap();
    assert_eq!(dominant(c(0.0, 0.0)), 0);
    assert_eq!(dominant(c(0.0, 2.0 * PI / 3.0)), 1);
    assert_eq!(dominant(c(0.0, 4.0 * PI / 3.0)), 2);
    assert_eq!(c(0.0, 2.0 * PI / 3.0), [0, 255, 0]);
    // The phase is taken modulo 2π.
    assert_eq!(c(0.3, -2.0 * PI / 3.0), c(0.3, 4.0 * PI / 3.0));
    assert_eq!(c(0.3, 0.1 + 2.0 * PI), c(0.3, 0.1));
    // Brightness (HSL lightness, (max + min)/2) increases with log|S|, at every hue.
    let l = |rgb: [u8; 3]| {
        (*rgb.iter().max().unwrap() as f64 + *rgb.iter().min().unwrap() as f64) / 510.0
    };
    for phase in [0.0, 1.0, 2.0, 3.0, 4.0, 5.0, 6.0] {
        let mut last = -1.0;
        for x in [-6.0, -3.0, -1.5, -0.5, 0.0, 0.5, 1.5, 3.0, 6.0] {
            let now = l(c(x, phase));
            assert!(now > last, "phase {phase}, log|S| = {x}: {now} ≤ {last}");
            last = now;
        }
    }
    assert!((lightness(0.0) - 0.5).abs() < 1e-15);
    assert_eq!(c(f64::NAN, 0.0), NEUTRAL);
    assert_eq!(c(0.0, f64::INFINITY), NEUTRAL);
}

#[test]
fn portrait_colours_match_the_factor() {
    // Every pixel of the adaptive grid is within a step or two of the colour
    // of log S evaluated at its centre.
    let m = lantern();
    for name in ["sigma", "lamp"] {
        let f = m.factor(name).unwrap();
        let grid = phase_grid(f, (-3.0, 3.0), (-0.5, PI + 0.5), (90, 70)).unwrap();
        let mut worst = 0;
        for j in 0..grid.height {
            for i in 0..grid.width {
                let (x, y) = grid.theta_at(i, j);
                let want =
                    match f.log_sum::<Complex64>(&Complex64::new(x, y), Prec::DOUBLE, Method::Auto)
                    {
                        Ok(s) => colour_of(s.log.value),
                        Err(_) => NEUTRAL,
                    };
                let got = grid.pixel(i, j);
                let d = (0..3)
                    .map(|k| (got[k] as i32 - want[k] as i32).abs())
                    .max()
                    .unwrap();
                worst = worst.max(d);
            }
        }
        assert!(worst <= 3, "{name}: a pixel is {worst} steps off");
    }
    // Orientation: the top row is Im θ = im.1, the left column Re θ = re.0.
    let f = m.factor("lamp").unwrap();
    let grid = phase_grid(f, (-1.0, 2.0), (0.0, 1.0), (30, 10)).unwrap();
    let (x, y) = grid.theta_at(0, 0);
    assert!(x < -0.9 && y > 0.9);
    let (x, y) = grid.theta_at(29, 9);
    assert!(x > 1.9 && y < 0.1);
    // A pure phase on the real line (lamp = Γ(g+z)/Γ(g−z) · G(1+z)/G(1−z) ·
    // exp(ig sinh θ) is unitary and real-analytic): mid-tone there.
    let s = f
        .log_sum::<Complex64>(&Complex64::new(0.7, 0.0), Prec::DOUBLE, Method::Auto)
        .unwrap();
    assert!(s.log.value.re.abs() < 1e-12);
    assert!((lightness(s.log.value.re) - 0.5).abs() < 1e-9);
}

#[test]
fn bad_input_gives_errors() {
    let m = lantern();
    let ok = tmp("ok.svg");
    let domain = |r: dressing::Result<PathBuf>, needle: &str| match r {
        Err(Error::Domain { message, .. }) => {
            assert!(message.contains(needle), "`{message}` lacks `{needle}`")
        }
        other => panic!("expected a domain error with `{needle}`, got {other:?}"),
    };
    let strip = |re, im, size, out: &Path| phase_portrait(&m, "sigma", re, im, size, &[], out);
    domain(strip((3.0, -3.0), (0.0, 1.0), (200, 150), &ok), "inverted");
    domain(
        strip((f64::NAN, 3.0), (0.0, 1.0), (200, 150), &ok),
        "not finite",
    );
    domain(
        strip((-3.0, 3.0), (1.0, f64::INFINITY), (200, 150), &ok),
        "not finite",
    );
    domain(strip((-3.0, 3.0), (1.0, 1.0), (200, 150), &ok), "inverted");
    domain(strip((-3.0, 3.0), (0.0, 1.0), (10, 10), &ok), "image size");
    let missing = Path::new("/nonexistent-dressing-dir/sub/p.svg");
    domain(
        strip((-3.0, 3.0), (0.0, 1.0), (200, 150), missing),
        "nonexistent-dressing-dir",
    );
    domain(
        strip((-3.0, 3.0), (0.0, 1.0), (200, 150), &tmp("p.pdf")),
        ".svg or .png",
    );
    let dir = tmp("d.svg");
    std::fs::create_dir_all(&dir).unwrap();
    domain(
        strip((-3.0, 3.0), (0.0, 1.0), (200, 150), &dir),
        "is a folder",
    );
    domain(
        real_line_plot(&m, "sigma", (6.0, -6.0), (200, 150), Prec::DOUBLE, &ok),
        "inverted",
    );
    domain(
        axis_plot(
            &m,
            "sigma",
            (0.0, f64::NAN),
            (200, 150),
            Prec::DOUBLE,
            &[],
            &ok,
        ),
        "not finite",
    );
    domain(
        axis_plot(
            &m,
            "sigma",
            (0.0, 1.0),
            (200, 150),
            Prec::DOUBLE,
            &[],
            missing,
        ),
        "nonexistent-dressing-dir",
    );
    assert!(matches!(
        phase_portrait(&m, "nope", (-1.0, 1.0), (0.0, 1.0), (200, 150), &[], &ok),
        Err(Error::Model { .. })
    ));
    // A path that exists as a file's child cannot be written.
    let file = tmp("a-file");
    std::fs::write(&file, "x").unwrap();
    domain(
        real_line_plot(
            &m,
            "sigma",
            (-1.0, 1.0),
            (200, 150),
            Prec::DOUBLE,
            &file.join("x.svg"),
        ),
        "a-file",
    );
}

fn cli(args: &[&str]) -> Result<dressing::cli::Report, String> {
    use clap::Parser;
    let cli = Cli::try_parse_from(std::iter::once("dressing").chain(args.iter().copied()))
        .map_err(|e| e.to_string())?;
    run(cli)
}

#[test]
fn command_line() {
    let out = tmp("cli-axis.png");
    let o = out.to_str().unwrap();
    let r = cli(&[
        "plot",
        "examples/lantern.toml",
        "--kind",
        "axis",
        "--factor",
        "dressed",
        "--im",
        "0.1:pi-0.1",
        "--size",
        "300x200",
        "--out",
        o,
    ])
    .unwrap();
    assert!(r.stdout.starts_with(&format!("wrote {o} ")), "{}", r.stdout);
    assert!(!r.failed);
    assert_png(&out, (300, 200));

    let out = tmp("cli-strip.svg");
    let o = out.to_str().unwrap();
    let r = cli(&[
        "plot",
        "examples/lantern.toml",
        "--kind",
        "strip",
        "--re",
        "-1:1",
        "--im",
        "0:pi",
        "--size",
        "200x150",
        "--set",
        "g=0.4",
        "--out",
        o,
    ])
    .unwrap();
    assert!(
        r.stdout.contains("phase portrait of `sigma`"),
        "{}",
        r.stdout
    );
    assert_svg(&out, "phase portrait of sigma");

    let out = tmp("cli-real.svg");
    let o = out.to_str().unwrap();
    cli(&[
        "plot",
        "examples/lantern.toml",
        "--kind",
        "real",
        "--factor",
        "lamp",
        "--digits",
        "20",
        "--size",
        "200x150",
        "--out",
        o,
    ])
    .unwrap();
    assert_svg(&out, "lamp (lantern) on the real line");

    // Errors name the option or the path.
    let err = |args: &[&str], needle: &str| {
        let e = cli(args).unwrap_err();
        assert!(e.contains(needle), "`{e}` lacks `{needle}`");
    };
    let m = "examples/lantern.toml";
    err(&["plot", m, "--kind", "strip", "--re", "3:-3"], "--re 3:-3");
    err(&["plot", m, "--kind", "strip", "--im", "0:1+i"], "not real");
    err(&["plot", m, "--kind", "strip", "--im", "0"], "A:B");
    err(&["plot", m, "--kind", "strip", "--re", "0:1/0"], "--re");
    err(
        &["plot", m, "--kind", "strip", "--size", "big"],
        "--size big",
    );
    err(
        &["plot", m, "--kind", "real", "--im", "0:1"],
        "does not apply",
    );
    err(
        &["plot", m, "--kind", "axis", "--re", "0:1"],
        "does not apply",
    );
    err(&["plot", m, "--kind", "bogus"], "bogus");
    err(&["plot", m, "--kind", "strip", "--factor", "nope"], "nope");
    err(
        &[
            "plot",
            m,
            "--kind",
            "axis",
            "--out",
            "/nonexistent-dressing-dir/x.svg",
        ],
        "/nonexistent-dressing-dir/x.svg",
    );
    err(
        &["plot", m, "--kind", "axis", "--out", "x.jpeg"],
        ".svg or .png",
    );
}
