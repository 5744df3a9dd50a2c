#!/usr/bin/env python3
"""Time the peer libraries (mpmath, python-flint/Arb, scipy if importable) on the
points used by the Rust criterion benchmarks; print a markdown table.

Usage:  python3 scripts/peer_timing.py [--json out.json] [--min-time 0.2] [--repeat 5]
                                      [--factor | --factor-only]

Points: z1 = 2.7+1.3i (generic), z2 = -7.3+0.4i (left half), z3 = 1e6+1e6i (large).
  log Gamma: every point at digits 15 (double), 50, 100, 300, 1000
  digamma and log Barnes G: z1 at 50 digits

mpmath runs at mp.dps = digits; python-flint at flint.ctx.prec =
ceil(digits*log2(10)) bits, except digits 15 which means double precision and
uses 53 bits (mpmath dps=15 is also 53 bits).  scipy.special.loggamma is timed
for the double row when scipy is importable.

With --factor (or --factor-only) it also times the gamma-product factor peers
on the point of benches/factor.rs: log(-S0(theta)) of the sine-Gordon soliton
factor at xi = 2*pi/7, theta = 0.7+0.2i, from the Zamolodchikov integral
-i * int_0^inf dt/t sinh(t(pi-xi)/2) sin(theta t) / (sinh(xi t/2) cosh(pi t/2)):
mpmath.quad on [0, inf] at 15 and 50 digits; mpmath.nsum of the gamma product's
k-th log factors at 50 digits; python-flint acb.integral on [0, T] at 50 digits
(T = 200: the integrand decays like exp(-0.7 t), so the cut-off error is below
1e-60). Each is run a few times only (they take 0.01-1 s per call).

Each timing: the argument is constructed outside the timed call (mpmath mpc,
flint acb, Python complex), the timed statement is the single function call, so
the value is computed afresh every call (neither library caches per-argument
results; both keep global caches of constants and Bernoulli numbers, which
stay warm, as they would in a Rust process).  The loop count is chosen so one
repeat takes >= --min-time seconds; the result is the minimum over --repeat
repeats, in microseconds per call.
"""

import argparse
import json
import math
import platform
import sys
import timeit

import mpmath

try:
    import flint
except ImportError:  # pragma: no cover
    flint = None
try:
    import scipy
    import scipy.special
except ImportError:
    scipy = None

POINTS = {
    "z1": (2.7, 1.3),
    "z2": (-7.3, 0.4),
    "z3": (1e6, 1e6),
}
DIGITS = [15, 50, 100, 300, 1000]


def cpu_model():
    try:
        with open("/proc/cpuinfo") as fh:
            for line in fh:
                if line.lower().startswith("model name"):
                    return line.split(":", 1)[1].strip()
    except OSError:
        pass
    return "unknown"


def bits_for(digits):
    return 53 if digits == 15 else int(math.ceil(digits * math.log2(10)))


def time_call(fn, min_time, repeat):
    """Minimum over `repeat` repeats of the per-call time (s) of fn()."""
    fn()  # warm up (global caches: constants, Bernoulli numbers)
    number = 1
    while True:
        t = timeit.timeit(fn, number=number)
        if t >= min_time:
            break
        number = max(number * 2, int(number * min_time / max(t, 1e-9) * 1.2))
    best = t / number
    for _ in range(repeat - 1):
        best = min(best, timeit.timeit(fn, number=number) / number)
    return best, number


FACTOR_POINT = (0.7, 0.2)
FACTOR_XI = 2 * math.pi / 7


def factor_peers(results, args):
    """Times the sine-Gordon factor peers (see the module docstring)."""
    re, im = FACTOR_POINT

    def record(func, digits, lib, setting, t, n, value):
        results.append({
            "function": func, "point": "sg", "z": list(FACTOR_POINT), "digits": digits,
            "library": lib, "setting": setting, "us_per_call": t * 1e6, "loops": n,
            "value": value,
        })
        print("  %-13s %5d %-22s %12.1f us  (%s)" % (func, digits, lib, t * 1e6, value),
              file=sys.stderr, flush=True)

    short = max(args.min_time / 4, 0.05)
    rep = min(args.repeat, 3)
    for digits in (15, 50):
        mpmath.mp.dps = digits
        xi = 2 * mpmath.pi / 7
        th = mpmath.mpc(re, im)
        pi = mpmath.pi

        def zz(t):
            if t == 0:
                return mpmath.mpf(0)
            return (mpmath.sinh(t * (pi - xi) / 2) * mpmath.sin(th * t)
                    / (mpmath.sinh(xi * t / 2) * mpmath.cosh(pi * t / 2) * t))

        def quad():
            return -1j * mpmath.quad(zz, [0, mpmath.inf])
        t, n = time_call(quad, short, rep)
        record("sg_log_s0", digits, "mpmath " + mpmath.__version__, "quad, dps=%d" % digits,
               t, n, mpmath.nstr(quad(), 15))
        if digits == 50:
            p = pi / xi
            z = th / (1j * pi)
            terms = [(1, -p, 1), (2 * p, -p, 1), (1 + p, p, 1), (p, p, 1),
                     (1, p, -1), (2 * p, p, -1), (1 + p, -p, -1), (p, -p, -1)]

            def kth(k):
                return sum(n * mpmath.loggamma(2 * p * k + b + s * z) for b, s, n in terms)

            def nsum():
                return mpmath.nsum(kth, [0, mpmath.inf])
            t, n = time_call(nsum, short, rep)
            record("sg_log_s0", digits, "mpmath " + mpmath.__version__, "nsum, dps=%d" % digits,
                   t, n, mpmath.nstr(nsum(), 15))
        mpmath.mp.dps = 15
    if flint is not None:
        digits = 50
        flint.ctx.prec = bits_for(digits) + 10
        xi = flint.arb.pi() * 2 / 7
        pi = flint.arb.pi()
        th = flint.acb(re, im)

        def g(t, analytic):
            return ((t * (pi - xi) / 2).sinh() * (th * t).sin()
                    / ((xi * t / 2).sinh() * (pi * t / 2).cosh() * t))

        def integral():
            return flint.acb.integral(g, 1e-30, 200) * flint.acb(0, -1)
        t, n = time_call(integral, short, rep)
        record("sg_log_s0", digits, "python-flint " + flint.__version__,
               "acb.integral on [1e-30, 200], prec=%d" % flint.ctx.prec, t, n,
               integral().str(15, radius=False))
        flint.ctx.prec = 53


def main():
    ap = argparse.ArgumentParser(description=__doc__.split("\n")[0])
    ap.add_argument("--json", help="write the results as JSON to this path")
    ap.add_argument("--min-time", type=float, default=0.2, help="seconds per repeat (>=)")
    ap.add_argument("--repeat", type=int, default=5)
    ap.add_argument("--factor", action="store_true", help="also time the factor peers")
    ap.add_argument("--factor-only", action="store_true", help="only the factor peers")
    args = ap.parse_args()

    machine = {
        "processor": platform.processor(),
        "cpu_model": cpu_model(),
        "platform": platform.platform(),
        "python": platform.python_version(),
        "mpmath": mpmath.__version__,
        "mpmath_backend": mpmath.libmp.BACKEND,
        "python_flint": flint.__version__ if flint else None,
        "scipy": scipy.__version__ if scipy else None,
    }

    cases = []
    for pname, (re, im) in ([] if args.factor_only else POINTS.items()):
        for d in DIGITS:
            cases.append(("loggamma", pname, d))
    if not args.factor_only:
        cases.append(("digamma", "z1", 50))
        cases.append(("log_barnes_g", "z1", 50))

    results = []

    def record(func, pname, digits, lib, setting, t, n, value):
        results.append({
            "function": func, "point": pname, "z": list(POINTS.get(pname, FACTOR_POINT)),
            "digits": digits,
            "library": lib, "setting": setting, "us_per_call": t * 1e6, "loops": n,
            "value": value,
        })
        print("  %-13s %-3s %5d %-22s %12.2f us  (%s)" % (func, pname, digits, lib, t * 1e6, value),
              file=sys.stderr, flush=True)

    for func, pname, digits in cases:
        re, im = POINTS[pname]

        # mpmath
        mpmath.mp.dps = digits
        z = mpmath.mpc(re, im)
        prec = mpmath.mp.prec
        f = {
            "loggamma": lambda: mpmath.loggamma(z),
            "digamma": lambda: mpmath.digamma(z),
            "log_barnes_g": lambda: mpmath.log(mpmath.barnesg(z)),
        }[func]
        t, n = time_call(f, args.min_time, args.repeat)
        record(func, pname, digits, "mpmath " + mpmath.__version__,
               "mp.dps=%d (prec %d)" % (digits, prec), t, n, mpmath.nstr(f(), 15))
        mpmath.mp.dps = 15

        # python-flint
        if flint is not None:
            bits = bits_for(digits)
            flint.ctx.prec = bits
            x = flint.acb(re, im)
            g = {
                "loggamma": x.lgamma,
                "digamma": x.digamma,
                "log_barnes_g": x.log_barnes_g,
            }[func]
            t, n = time_call(g, args.min_time, args.repeat)
            record(func, pname, digits, "python-flint " + flint.__version__,
                   "ctx.prec=%d" % bits, t, n, g().str(15, radius=False))
            flint.ctx.prec = 53

        # scipy (double only)
        if func == "loggamma" and digits == 15:
            if scipy is not None:
                w = complex(re, im)
                h = lambda: scipy.special.loggamma(w)  # noqa: E731
                t, n = time_call(h, args.min_time, args.repeat)
                record(func, pname, digits, "scipy " + scipy.__version__, "complex128", t, n, repr(h()))
            else:
                results.append({"function": func, "point": pname, "z": list(POINTS[pname]),
                                "digits": digits, "library": "scipy", "setting": "complex128",
                                "us_per_call": None, "loops": 0, "value": "scipy not importable"})

    if args.factor or args.factor_only:
        factor_peers(results, args)

    # markdown
    print("## Peer timings (microseconds per call, min of %d repeats of >= %.2f s)" % (
        args.repeat, args.min_time))
    print()
    print("Machine: processor `%s`, CPU `%s`, %s, Python %s" % (
        machine["processor"] or "?", machine["cpu_model"], machine["platform"], machine["python"]))
    print("Libraries: mpmath %s (backend %s), python-flint %s, scipy %s" % (
        machine["mpmath"], machine["mpmath_backend"], machine["python_flint"] or "not installed",
        machine["scipy"] or "not installed"))
    print()
    print("Points: z1 = 2.7+1.3i, z2 = -7.3+0.4i, z3 = 1e6+1e6i. Digits 15 = double "
          "(mpmath dps 15 / Arb 53 bits); otherwise Arb prec = ceil(digits*log2 10) bits.")
    print()
    print("| function | point | digits | library | setting | µs/call |")
    print("|---|---|---:|---|---|---:|")
    for r in results:
        us = "n/a" if r["us_per_call"] is None else "%.2f" % r["us_per_call"]
        print("| %s | %s | %d | %s | %s | %s |" % (
            r["function"], r["point"], r["digits"], r["library"], r["setting"], us))
    if scipy is None:
        print()
        print("scipy is not importable: scipy.special.loggamma skipped.")

    if args.json:
        with open(args.json, "w") as fh:
            json.dump({"machine": machine, "min_time_s": args.min_time, "repeat": args.repeat,
                       "points": POINTS, "results": results}, fh, indent=2)
            fh.write("\n")


if __name__ == "__main__":
    main()
