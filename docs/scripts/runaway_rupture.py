#!/usr/bin/env python3
"""Reference of testdata/runaway-rupture (docs/references.md section 15).

A plane-strain fault of half-length a, all at residual friction mu_d, under
the pressure p0 + dp*erfc(|x|/sqrt(4 D t)) of a line source held at dp: its
stress drop is dtau(x) = tau - mu_d*(sigma_n - p(x)). By Betti's reciprocity
with the uniform-drop crack, whose slip is 2(1-nu)/G*sqrt(a^2 - x^2)
(Pollard & Segall 1987), the mean slip is
    2(1-nu)/(2 a G) * int_{-a}^{a} dtau(x) sqrt(a^2 - x^2) dx,
integrated with x = a sin(theta). Prints the value stored in reference.json.
Run with Debian's python3 (/usr/bin/python3, python3-scipy).
"""
import math

from scipy.integrate import quad
from scipy.special import erfc

G, NU, A = 15e9, 0.25, 800.0
TAU, SIGMA_N, P0, DP, MU_D = 7.794228634e6, 46.5e6, 20e6, 20e6, 0.25
D = (3e-5) ** 2 / (12 * 1e-3 * 4.5e-10)  # e^2/(12 mu c_f), m^2/s
T = 60.0


def drop(x):
    return TAU - MU_D * (SIGMA_N - P0 - DP * erfc(abs(x) / math.sqrt(4 * D * T)))


half, err = quad(lambda th: drop(A * math.sin(th)) * A * A * math.cos(th) ** 2,
                 0, math.pi / 2, epsabs=0, epsrel=1e-13, limit=200)
mean = 2 * (1 - NU) / G * 2 * half / (2 * A)
print(f"diffusivity {D!r} m2/s; mean slip {mean * 1e3!r} mm (quadrature error {err:.1e})")
