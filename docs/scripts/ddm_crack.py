#!/usr/bin/python3
"""Constant-element displacement discontinuity method (Crouch & Starfield
1983, ch. 5): the pressurized-crack check values of docs/references.md §9.2
(and, with h, the finite-height factor of §9.3). Prints the opening of the
element centred at x = +c/N for N = 10 and its ratio to Sneddon's
analytic opening: 5.2321927514e-05 and 1.05171031.

Needs Debian's numpy: apt-get install python3-numpy
"""
import numpy as np

G, nu, p = 30e9, 0.25, 1e6
C = 1 / (4 * np.pi * (1 - nu))


def syy_Dy(x, y, a):  # sigma_yy per unit D_y (tension +)
    r1, r2 = (x - a)**2 + y**2, (x + a)**2 + y**2
    fyy = -C * ((x - a) / r1 - (x + a) / r2)
    fyyy = 2 * y * C * ((x - a) / r1**2 - (x + a) / r2**2)
    return 2 * G * (fyy - y * fyyy)


def crack(N, c=1.0, h=None, beta=2.3, alpha=1.0):
    a = c / N
    xc = -c + a * (2 * np.arange(N) + 1)
    A = syy_Dy(xc[:, None] - xc[None, :], 0.0, a)
    if h is not None:
        d = np.abs(xc[:, None] - xc[None, :])
        A = A * (1 - d**beta / (d**2 + (h / alpha)**2)**(beta / 2))
    return xc, -np.linalg.solve(A, -p * np.ones(N))  # opening w = -D_y


xc, w = crack(10)
print(w[5], w[5] / (2 * (1 - nu) * p / G * np.sqrt(1 - xc[5]**2)))
