#!/usr/bin/env python3
"""Coefficients of the polynomial kernels in kernels/mod.rs.

Each kernel approximates a smooth remainder on a short interval by
Chebyshev interpolation in 50-digit arithmetic (mpmath.chebyfit, which
returns the power-basis polynomial of the Chebyshev interpolant: within a
small factor of the minimax polynomial), then rounds the coefficients to
f64. Run: python3 src/lambert/kernels/fit.py (needs mpmath); it prints the
Rust constants and the interpolation error of each fit.

- ATAN: atan(u) = u + u w P(w), w = u^2, |u| <= 7/16.
- ATANH: atanh(f) = f + f w Q(w), w = f^2, |f| <= (sqrt 2 - 1)/(sqrt 2 + 1)
  (log(m) = 2 atanh((m - 1)/(m + 1)) for m in [sqrt(1/2), sqrt(2))).
- EXP2: 2^r = 1 + r E(r), |r| <= 1/2.
- CBRT: the cube root on [1, 2], a starting value for one Halley step
  (which triples the digits: six are needed).
It also prints the split constants (a 40-bit head, whose sums and
differences are exact, plus the rounded tail).
"""
import mpmath as mp

mp.mp.dps = 50


def remainder(f, first):
    def g(w):
        if w == 0:
            return first
        u = mp.sqrt(w)
        return (f(u) / u - 1) / w
    return g


def exp2_rem(r):
    if r == 0:
        return mp.log(2)
    return (mp.power(2, r) - 1) / r


def show(name, f, a, b, n, scale):
    poly, err = mp.chebyfit(f, [a, b], n, error=True)
    print(f"// {name}: {n} coefficients on [{mp.nstr(a, 6)}, {mp.nstr(b, 6)}], "
          f"interpolation error {mp.nstr(err, 3)} (relative to the result: {mp.nstr(err * scale, 3)})")
    print(f"const {name}: [f64; {n}] = [")
    for c in poly:  # highest degree first
        print(f"    {float(c)!r},")
    print("];")


umax = mp.mpf(7) / 16
show("ATAN", remainder(mp.atan, mp.mpf(-1) / 3), 0, umax ** 2, 12, umax ** 2)
fmax = (mp.sqrt(2) - 1) / (mp.sqrt(2) + 1)
show("ATANH", remainder(mp.atanh, mp.mpf(1) / 3), 0, fmax ** 2, 7, fmax ** 2)
show("EXP2", exp2_rem, mp.mpf(-0.5), mp.mpf(0.5), 11, mp.mpf(0.5))
show("CBRT", mp.cbrt, mp.mpf(1), mp.mpf(2), 6, mp.mpf(1))
print(f"const CBRT_2: f64 = {float(mp.cbrt(2))!r};")
print(f"const CBRT_4: f64 = {float(mp.cbrt(4))!r};")


def split(name, v, bits):
    m, e = mp.frexp(v)
    hi = mp.ldexp(mp.nint(mp.ldexp(m, bits)), e - bits)
    print(f"const {name}: (f64, f64) = ({float(hi)!r}, {float(v - hi)!r});")


for name, v in [("ATAN_HALF", mp.atan(mp.mpf(1) / 2)), ("PI_4", mp.pi / 4),
                ("ATAN_3HALF", mp.atan(mp.mpf(3) / 2)), ("PI_2", mp.pi / 2), ("PI", mp.pi)]:
    split(name, v, 40)
split("LN2", mp.log(2), 42)
