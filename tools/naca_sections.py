#!/usr/bin/env python3
"""Write NACA 4-digit and 5-digit section coordinates as two-column "x z" text for Skein's camber files.

The equations are those of I. H. Abbott and A. E. von Doenhoff, Theory of Wing Sections, Dover 1959, sec. 6.4
and 6.5 (the 4-digit and the 5-digit families), with the thickness laid off perpendicular to the mean line:
    thickness  z_t = 5 t (0.2969 sqrt(x) - 0.1260 x - 0.3516 x^2 + 0.2843 x^3 - 0.1015 x^4)
    4-digit    z_c = m/p^2 (2 p x - x^2) for x < p,  m/(1-p)^2 ((1 - 2p) + 2 p x - x^2) for x >= p
    5-digit    z_c = k1/6 (x^3 - 3 r x^2 + r^2 (3 - r) x) for x < r,  k1 r^3 / 6 (1 - x) for x >= r,
               with (r, k1) from the book's table for the mean lines 210..250 (design cl 0.3), k1 scaled by
               design cl / 0.3 for the first digit.
Points run from the trailing edge over the upper surface to the leading edge and back along the lower surface,
with cosine spacing in x (dense at both edges).

    tools/naca_sections.py 2412 cases/airfoils/naca2412.dat [--points 81]
"""
import argparse
import math
import sys

# (position of maximum camber p) -> (r, k1), Abbott & von Doenhoff, Table of 5-digit mean-line constants
# (design lift coefficient 0.3).
FIVE_DIGIT = {0.05: (0.0580, 361.4), 0.10: (0.1260, 51.64), 0.15: (0.2025, 15.957), 0.20: (0.2900, 6.643),
              0.25: (0.3910, 3.230)}


def thickness(x, t):
    return 5.0 * t * (0.2969 * math.sqrt(x) - 0.1260 * x - 0.3516 * x**2 + 0.2843 * x**3 - 0.1015 * x**4)


def mean_line(designation):
    """Returns (z_c(x), dz_c/dx(x), t) for a 4- or 5-digit designation."""
    d = designation
    if len(d) == 4:
        m, p, t = int(d[0]) / 100.0, int(d[1]) / 10.0, int(d[2:]) / 100.0
        if m == 0.0:
            return (lambda x: 0.0), (lambda x: 0.0), t
        if p == 0.0:
            raise ValueError("a cambered 4-digit section needs its second digit 1..9")

        def zc(x):
            return m / p**2 * (2 * p * x - x * x) if x < p else m / (1 - p)**2 * ((1 - 2 * p) + 2 * p * x - x * x)

        def dzc(x):
            return 2 * m / p**2 * (p - x) if x < p else 2 * m / (1 - p)**2 * (p - x)
        return zc, dzc, t
    if len(d) == 5:
        cl, p, reflex, t = int(d[0]) * 0.15, int(d[1]) / 20.0, d[2], int(d[3:]) / 100.0
        if reflex != "0" or round(p, 2) not in FIVE_DIGIT:
            raise ValueError("5-digit sections: the third digit must be 0 and the second 1..5")
        r, k1 = FIVE_DIGIT[round(p, 2)]
        k1 *= cl / 0.3

        def zc(x):
            return k1 / 6 * (x**3 - 3 * r * x * x + r * r * (3 - r) * x) if x < r else k1 * r**3 / 6 * (1 - x)

        def dzc(x):
            return k1 / 6 * (3 * x * x - 6 * r * x + r * r * (3 - r)) if x < r else -k1 * r**3 / 6
        return zc, dzc, t
    raise ValueError("expected 4 or 5 digits")


def coordinates(designation, points):
    zc, dzc, t = mean_line(designation)
    xs = [0.5 * (1 - math.cos(math.pi * i / (points - 1))) for i in range(points)]
    upper, lower = [], []
    for x in xs:
        th = math.atan(dzc(x))
        yt = thickness(x, t)
        upper.append((x - yt * math.sin(th), zc(x) + yt * math.cos(th)))
        lower.append((x + yt * math.sin(th), zc(x) - yt * math.cos(th)))
    return list(reversed(upper)) + lower[1:]


def main():
    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("designation", help="4 or 5 digits, e.g. 2412 or 23012")
    ap.add_argument("output", help="file to write ('-' for standard output)")
    ap.add_argument("--points", type=int, default=81, help="points per surface, leading edge shared (default 81)")
    a = ap.parse_args()
    try:
        pts = coordinates(a.designation, a.points)
    except ValueError as e:
        sys.exit(f"naca_sections.py: NACA {a.designation}: {e}")
    text = f"NACA {a.designation} (Abbott & von Doenhoff equations; tools/naca_sections.py)\n"
    text += "".join(f"{x:.7f} {z:.7f}\n" for x, z in pts)
    if a.output == "-":
        sys.stdout.write(text)
    else:
        with open(a.output, "w") as f:
            f.write(text)


if __name__ == "__main__":
    main()
