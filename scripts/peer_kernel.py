#!/usr/bin/env python3
"""Time mpmath on the sine-Gordon kernel of benches/table.rs; check it against dressing table.

Usage:  python3 scripts/peer_kernel.py [--compare TABLE.csv] [--repeat 3] [--json out.json]

The kernel is d/dtheta log(-S0(theta)) of the sine-Gordon soliton factor at
xi = 2*pi/7 (tests/data/models/sine-gordon.toml, factor minus_S0): the
Zamolodchikov integral (Zamolodchikov & Zamolodchikov, Ann. Phys. 120 (1979)
253) differentiated under the integral sign,

  d/dtheta log(-S0) = -i * I(theta),
  I(theta) = int_0^inf dt sinh(t(pi-xi)/2) cos(theta t) / (sinh(xi t/2) cosh(pi t/2)),

valid for |Im theta| < xi (the integrand decays like exp(-(xi - |Im theta|) t)).
dressing table prints phi = -i d/dtheta log S, so phi = -I: on the real line
phi_re = -Re I and phi_im = -Im I = 0.

Two ways of calling mpmath.quad (tanh-sinh, the default rule) are timed:
  "plain":  quad(f, [0, inf]), the obvious call (as in scripts/peer_timing.py).
            For |theta| >~ 3 on the real line cos(theta t) makes it lose
            digits: at theta = 8 it is off by 6% and its own error estimate
            says 1e-4;
  "split":  quad(f, [0, 1, 2, ..., 40, inf]), unit sub-intervals up to
            t = 40 (where the integrand is 2e-16 of its size at 0),
            which is within 3e-16 of the reference below at every point of the line.
Timed:
  - mp.dps = 15 at the 100 points linspace(-8, 8, 100), one call per point,
    each timed on its own (the quadrature nodes are cached after a warm-up
    call, as they would stay warm in a long run); these are every 101st
    point of the 10 000-point line of benches/table.rs (9999 = 99 * 101), so
    the total times 100 is the per-point extrapolation to that table;
  - mp.dps = 15 and mp.dps = 50 at theta = 0.7+0.2i, the point of the
    benchmark's `kernel` group: minimum over --repeat calls (plain only: at
    this point it is accurate: 1e-51 from a dps-70 reference at dps 50).

With --compare TABLE.csv (the output of
  dressing table tests/data/models/sine-gordon.toml --line -8:8 --n 101
or '-' for stdin) it also evaluates -I at every row's theta with the same
calls (plain and split, dps 15) and reports the largest |phi_re - (-Re I)|
and |phi_im - (-Im I)|; and, to say who is wrong where they differ, a
reference at mp.dps = 30 from mpmath.quad on [0, 0.5, 1, ..., 80] + [80, inf]
(sub-intervals shorter than the shortest period 2*pi/8 of cos(theta t)).
"""

import argparse
import csv
import io
import json
import sys
import time

import mpmath
from mpmath import mp, mpc, mpf

XI_NUM = (2, 7)  # xi = 2*pi/7
KERNEL_POINT = (0.7, 0.2)


def integrand(theta):
    """t -> sinh(t(pi-xi)/2) cos(theta t) / (sinh(xi t/2) cosh(pi t/2)) at the current mp.dps."""
    pi = mp.pi
    xi = XI_NUM[0] * pi / XI_NUM[1]
    a, b, c = (pi - xi) / 2, xi / 2, pi / 2
    at0 = a / b  # the limit t -> 0

    def f(t):
        if t == 0:
            return at0
        return mpmath.sinh(a * t) * mpmath.cos(theta * t) / (mpmath.sinh(b * t) * mpmath.cosh(c * t))
    return f


def phi_quad(theta):
    """phi = -i d/dtheta log(-S0) = -I(theta), mpmath.quad on [0, inf]."""
    return -mpmath.quad(integrand(theta), [0, mpmath.inf])


def phi_split(theta):
    """The same on unit sub-intervals up to t = 40 (see the docstring)."""
    return -mpmath.quad(integrand(theta), list(range(41)) + [mpmath.inf])


METHODS = {"plain": phi_quad, "split": phi_split}


def phi_reference(theta):
    """The same at the current mp.dps on short sub-intervals (see the docstring)."""
    cuts = [mpf(k) / 2 for k in range(161)] + [mpmath.inf]
    return -mpmath.quad(integrand(theta), cuts)


def as_mpc(x):
    return mpc(x[0], x[1]) if isinstance(x, tuple) else mpc(x)


def read_table(path):
    text = sys.stdin.read() if path == "-" else open(path).read()
    rows = []
    for r in csv.DictReader(io.StringIO(text)):
        if r["status"] != "ok":
            print("  row theta = %s: status %r, skipped" % (r["theta_re"], r["status"]), file=sys.stderr)
            continue
        rows.append(((float(r["theta_re"]), float(r["theta_im"])),
                     complex(float(r["phi_re"]), float(r["phi_im"]))))
    return rows


def compare(path, out):
    rows = read_table(path)
    keys = ["plain_re", "plain_im", "split_re", "split_im", "ref_dressing", "ref_plain", "ref_split"]
    worst = {k: (0.0, None) for k in keys}
    print("Comparison with %s (%d rows): phi = -I, quad at dps 15, ref at dps 30" % (path, len(rows)))
    print("%9s %23s %23s %9s %9s %9s %9s %9s" % ("theta_re", "phi_re (dressing)", "-Re I (plain)",
                                                 "d plain", "d split", "ours-ref", "plain-ref", "split-ref"))
    records = []
    for (x, y), ours in rows:
        mp.dps = 15
        th = mpc(x, y)
        peer = {name: complex(fn(th)) for name, fn in METHODS.items()}
        mp.dps = 30
        ref = phi_reference(mpc(x, y))
        mp.dps = 15
        d = {}
        for name, v in peer.items():
            d[name + "_re"] = abs(ours.real - v.real)
            d[name + "_im"] = abs(ours.imag - v.imag)
            d["ref_" + name] = float(abs(mpc(v) - ref))
        d["ref_dressing"] = float(abs(mpc(ours) - ref))
        for key in keys:
            if d[key] > worst[key][0]:
                worst[key] = (d[key], x)
        print("%9.4f %23.15e %23.15e %9.1e %9.1e %9.1e %9.1e %9.1e" % (
            x, ours.real, peer["plain"].real, d["plain_re"], d["split_re"], d["ref_dressing"],
            d["ref_plain"], d["ref_split"]))
        records.append({"theta": [x, y], "phi_dressing": [ours.real, ours.imag],
                        "phi_plain": [peer["plain"].real, peer["plain"].imag],
                        "phi_split": [peer["split"].real, peer["split"].imag],
                        "phi_ref": [float(ref.real), float(ref.imag)]})
    print()
    for key, what in (("plain_re", "max |phi_re - (-Re I)|, dressing vs plain quad"),
                      ("plain_im", "max |phi_im - (-Im I)|, dressing vs plain quad"),
                      ("split_re", "max |phi_re - (-Re I)|, dressing vs split quad"),
                      ("split_im", "max |phi_im - (-Im I)|, dressing vs split quad"),
                      ("ref_dressing", "max |phi - ref|, dressing"),
                      ("ref_plain", "max |phi - ref|, plain quad"),
                      ("ref_split", "max |phi - ref|, split quad")):
        v, x = worst[key]
        print("%-50s %.3e  (at theta = %s)" % (what, v, x))
    out["compare"] = {"table": path, "rows": records,
                      "max": {k: {"value": v, "theta_re": x} for k, (v, x) in worst.items()}}


def time_line(name, fn, thetas):
    """Per-point times of fn at the current mp.dps (one warm-up call first)."""
    fn(thetas[0])  # warm-up: nodes for this precision
    per_point = []
    print()
    print("%s: mpmath.quad, mp.dps = %d, 100 points linspace(-8, 8, 100):" % (name, mp.dps))
    print("%10s %10s %24s" % ("theta", "ms", "phi = -I"))
    for th in thetas:
        t0 = time.perf_counter()
        v = fn(th)
        dt = time.perf_counter() - t0
        per_point.append(dt)
        print("%10.5f %10.3f %24s" % (float(th), dt * 1e3, mpmath.nstr(mpmath.re(v), 15)))
    total = sum(per_point)
    srt = sorted(per_point)
    median = (srt[49] + srt[50]) / 2
    print("%s: total %.3f s for 100 points: mean %.2f ms, median %.2f ms, min %.2f ms, max %.2f ms per point"
          % (name, total, total * 10, median * 1e3, srt[0] * 1e3, srt[-1] * 1e3))
    print("%s: extrapolated to the 10 000 points of benches/table.rs: %.1f s (total x 100)"
          % (name, total * 100))
    return {"points": [float(t) for t in thetas], "seconds": per_point, "total_s": total,
            "median_s": median, "extrapolated_10000_s": total * 100}


def main():
    ap = argparse.ArgumentParser(description=__doc__.split("\n")[0])
    ap.add_argument("--compare", metavar="TABLE.csv", help="dressing table CSV to check ('-' = stdin)")
    ap.add_argument("--repeat", type=int, default=3, help="calls at theta = 0.7+0.2i (minimum taken)")
    ap.add_argument("--json", help="write the timings (and comparison) as JSON to this path")
    args = ap.parse_args()

    print("mpmath %s (backend %s), Python %s" % (mpmath.__version__, mpmath.libmp.BACKEND,
                                               sys.version.split()[0]))
    out = {"mpmath": mpmath.__version__, "backend": mpmath.libmp.BACKEND, "line": {}}

    # 100 points on the real line, dps 15.
    mp.dps = 15
    thetas = [mpf(-8) + mpf(16) * k / 99 for k in range(100)]
    for name, fn in METHODS.items():
        out["line"][name] = time_line(name, fn, thetas)

    # theta = 0.7+0.2i, dps 15 and 50.
    print()
    out["kernel_point"] = {}
    for dps in (15, 50):
        mp.dps = dps
        th = as_mpc(KERNEL_POINT)
        v = phi_quad(th)  # warm-up: nodes for this precision
        best = None
        for _ in range(args.repeat):
            t0 = time.perf_counter()
            v = phi_quad(th)
            dt = time.perf_counter() - t0
            best = dt if best is None else min(best, dt)
        print("plain: mpmath.quad, mp.dps = %d, theta = 0.7+0.2i: %.2f ms (min of %d)   phi = %s"
              % (dps, best * 1e3, args.repeat, mpmath.nstr(v, 20)))
        out["kernel_point"][str(dps)] = {"seconds": best, "phi": [str(v.real), str(v.imag)]}
    mp.dps = 15

    if args.compare:
        print()
        compare(args.compare, out)

    if args.json:
        with open(args.json, "w") as fh:
            json.dump(out, fh, indent=2)
            fh.write("\n")


if __name__ == "__main__":
    main()
