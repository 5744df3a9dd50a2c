#!/usr/bin/env python3
"""Long-running mpmath oracle for the Rust live tests.

Protocol (one request per line on stdin, one answer line on stdout, flushed):

    FUNC DIGITS RE IM [EXTRA]

  FUNC    loggamma | digamma | polygamma | barnesg_abs_arg | hurwitz
  DIGITS  requested significant digits (integer >= 1)
  RE IM   decimal strings, parsed with mpmath.mpf(str) at mp.dps = DIGITS+30
          (the argument z; for hurwitz they are the parameter a)
  EXTRA   polygamma: the order n >= 0;  hurwitz: the integer s

Answer:  "RE_OUT IM_OUT", each with DIGITS+10 significant digits in scientific
notation (e.g. -1.2345e-7, 3.0e0, 0.0e0), or "ERR message".

  loggamma         mpmath.loggamma(z): principal log Gamma, analytic in C minus
                   (-inf, 0]; on the negative real axis (IM = 0) mpmath gives the
                   limit from the upper half plane, Im = -pi*ceil(-x)
  digamma          mpmath.digamma(z)
  polygamma        mpmath.polygamma(n, z) (for n >= 1 and Re z < -1000 via the
                   reflection formula DLMF 5.15.6, because mpmath.polygamma costs
                   O(|Re z|) there; see scripts/gen_reference.py)
  barnesg_abs_arg  log|G(z)| and arg G(z) in (-pi, pi] (principal), from
                   mpmath.barnesg(z)
  hurwitz          mpmath.zeta(s, a)

Everything is computed at mp.dps = DIGITS+30.  The first line printed is
"mpmath VERSION".  The oracle exits at end of input.
"""

import math
import sys

import mpmath
from mpmath import mp, mpc, mpf

# One implementation of the reference polygamma (with its reflection branch
# for Re z < -1000) serves both the tables and this oracle.
from gen_reference import polygamma_ref  # noqa: E402


def sci(x, n):
    """x (mpf) with n significant digits in scientific notation."""
    if x == 0:
        return "0.0e0"
    s = mpmath.nstr(x, n, min_fixed=1, max_fixed=0).replace("e+", "e")
    if "e" not in s:
        s += "e0"
    return s


def parse_int(s, what):
    try:
        return int(s)
    except ValueError:
        raise ValueError("%s must be an integer, got %r" % (what, s))


def answer(line):
    parts = line.split()
    if not parts:
        raise ValueError("empty request")
    func = parts[0]
    if func in ("polygamma", "hurwitz"):
        if len(parts) != 5:
            raise ValueError("%s needs: FUNC DIGITS RE IM EXTRA" % func)
    elif func in ("loggamma", "digamma", "barnesg_abs_arg"):
        if len(parts) != 4:
            raise ValueError("%s needs: FUNC DIGITS RE IM" % func)
    else:
        raise ValueError("unknown function %r" % func)
    digits = parse_int(parts[1], "DIGITS")
    if not 1 <= digits <= 1000000:
        raise ValueError("DIGITS out of range: %d" % digits)
    mp.dps = digits + 30
    re_, im_ = mpf(parts[2]), mpf(parts[3])
    if not (mpmath.isfinite(re_) and mpmath.isfinite(im_)):
        raise ValueError("non-finite input")
    z = mpc(re_, im_)
    if func == "loggamma":
        v = mpmath.loggamma(z)
    elif func == "digamma":
        v = mpmath.digamma(z)
    elif func == "polygamma":
        n = parse_int(parts[4], "order n")
        if n < 0:
            raise ValueError("order n must be >= 0")
        v = polygamma_ref(n, z)
    elif func == "barnesg_abs_arg":
        g = mpmath.barnesg(z)
        if g == 0:
            raise ValueError("G(z) = 0")
        v = mpmath.log(g)          # principal: log|G| + i arg G, arg in (-pi, pi]
    else:  # hurwitz
        s = parse_int(parts[4], "s")
        a = re_ if im_ == 0 else z
        v = mpmath.zeta(s, a)
    v = mpc(v)
    if not (mpmath.isfinite(v.real) and mpmath.isfinite(v.imag)):
        raise ValueError("non-finite result %s" % v)
    return "%s %s" % (sci(v.real, digits + 10), sci(v.imag, digits + 10))


def main():
    out = sys.stdout
    out.write("mpmath %s\n" % mpmath.__version__)
    out.flush()
    while True:
        line = sys.stdin.readline()
        if not line:
            break
        try:
            reply = answer(line)
        except Exception as e:  # noqa: BLE001 - every failure becomes one ERR line
            msg = ("%s: %s" % (type(e).__name__, e)).replace("\n", " ").replace("\r", " ")
            reply = "ERR " + msg
        out.write(reply + "\n")
        out.flush()


if __name__ == "__main__":
    main()
