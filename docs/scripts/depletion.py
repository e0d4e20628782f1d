#!/usr/bin/python3
"""Check values of docs/references.md §13.1, the stress change of a depleted
region in a layer (package mechanics, Layer, DepletedEllipse, GridResponse).

1. The corner formulas of a rectangular prism at its mid-height against a
   brute-force triple integral of the Hessian of 1/r (an exterior point).
2. The depleted ellipse in a layer of finite thickness (boundary integral of
   the line kernel) against a brute-force triple integral (an exterior point).
3. The centre of a depleted circle in a layer, 1 - c/(2 sqrt(a^2 + c^2)),
   against the boundary integral.
4. The SHmax rotation around a depleted ellipse in the plane-strain limit
   (Eshelby's elliptic cylinder): a = 300 m east, b = 100 m, dp = -10 MPa,
   alpha = 1, nu = 0.22; in situ SHmax 52 MPa at N60E, Shmin 48 MPa. Prints
   the changes, the new principal stresses from an eigen-decomposition, the
   SHmax azimuth and the rotation, as in TestRotationAroundEllipse.

Needs Debian's numpy and scipy: apt-get install python3-numpy python3-scipy
"""
import numpy as np
from scipy import integrate


def hessian_brute(x, y, region_x, region_y, c):
    """psi_ij at (x, y, 0) of the body region_x x region_y(x') x [-c, c]."""
    out = {}
    for i, j in [(0, 0), (1, 1), (0, 1)]:
        def f(z, yy, xx):
            X = np.array([xx - x, yy - y, z])
            r = np.sqrt(X @ X)
            return 3 * X[i] * X[j] / r**5 - (1.0 if i == j else 0.0) / r**3
        out[(i, j)], _ = integrate.tplquad(f, region_x[0], region_x[1], region_y[0], region_y[1],
                                           -c, c, epsabs=1e-11, epsrel=1e-11)
    return out


def prism_corners(x, y, x1, x2, y1, y2, c):
    def gxx(X, Y):
        return -2 * np.arctan(c * Y / (X * np.sqrt(X * X + Y * Y + c * c)))

    def gyy(X, Y):
        return -2 * np.arctan(c * X / (Y * np.sqrt(X * X + Y * Y + c * c)))

    def gxy(X, Y):
        return 2 * np.arcsinh(c / np.hypot(X, Y))
    X1, X2, Y1, Y2 = x1 - x, x2 - x, y1 - y, y2 - y
    return {k: G(X2, Y2) - G(X1, Y2) - G(X2, Y1) + G(X1, Y1)
            for k, G in [((0, 0), gxx), ((1, 1), gyy), ((0, 1), gxy)]}


def ellipse_boundary(a, b, c, x, y, n=1 << 16):
    t = np.arange(n) * 2 * np.pi / n
    X, Y = a * np.cos(t) - x, b * np.sin(t) - y
    r2 = X * X + Y * Y
    k = -2 / r2 if np.isinf(c) else -2 * c / (r2 * np.sqrt(r2 + c * c))
    w = 2 * np.pi / n
    nx, ny = b * np.cos(t), a * np.sin(t)
    return {(0, 0): w * np.sum(nx * X * k), (1, 1): w * np.sum(ny * Y * k), (0, 1): w * np.sum(nx * Y * k)}


def eshelby_cylinder(a, b, x, y):
    """psi_ij of the elliptic cylinder (a along x, b along y) and 1 inside."""
    if x * x / a**2 + y * y / b**2 <= 1:
        return -4 * np.pi * b / (a + b), -4 * np.pi * a / (a + b), 0.0, 1
    beta = a * a + b * b - x * x - y * y
    gamma = a * a * b * b - x * x * b * b - y * y * a * a
    lam = (-beta + np.sqrt(beta * beta - 4 * gamma)) / 2
    P, Q = np.sqrt(a * a + lam), np.sqrt(b * b + lam)
    T = x * x / (a * a + lam)**2 + y * y / (b * b + lam)**2
    xx = -2 * np.pi * a * b * (2 / (P * (P + Q)) - 2 * x * x / ((a * a + lam)**2 * P * Q * T))
    yy = -2 * np.pi * a * b * (2 / (Q * (P + Q)) - 2 * y * y / ((b * b + lam)**2 * P * Q * T))
    xy = 4 * np.pi * a * b * x * y / ((a * a + lam) * (b * b + lam) * P * Q * T)
    return xx, yy, xy, 0


print("1. prism corners vs brute force")
print("  ", prism_corners(0.3, -0.2, 1, 2.5, 0.5, 1.7, 0.4))
print("  ", hessian_brute(0.3, -0.2, (1, 2.5), (0.5, 1.7), 0.4))

print("2. ellipse a=3, b=1.2, h=0.8 at (4, 1): boundary integral vs brute force")
a, b = 3.0, 1.2
print("  ", ellipse_boundary(a, b, 0.4, 4.0, 1.0))
print("  ", hessian_brute(4.0, 1.0, (-a, a), (lambda xx: -b * np.sqrt(max(0, 1 - xx * xx / a / a)),
                                             lambda xx: b * np.sqrt(max(0, 1 - xx * xx / a / a))), 0.4))

print("3. circle a=2, h=1, centre: psi_xx by boundary integral and -2 pi c/sqrt(a^2+c^2)")
print("  ", ellipse_boundary(2, 2, 0.5, 0, 0)[(0, 0)], -2 * np.pi * 0.5 / np.sqrt(4 + 0.25))

print("4. SHmax rotation around a depleted ellipse (plane strain)")
nu = 0.22
A, dp = (1 - 2 * nu) / (1 - nu), -10e6
SH, Sh, th = 52e6, 48e6, np.radians(60)
s, c = np.sin(th), np.cos(th)
S0 = np.array([[SH * s * s + Sh * c * c, (SH - Sh) * s * c], [(SH - Sh) * s * c, SH * c * c + Sh * s * s]])
for p in [(0, 0), (150, 50), (400, 0), (0, 200), (250, 150), (-250, 150)]:
    xx, yy, xy, inside = eshelby_cylinder(300.0, 100.0, *p)
    k = A * dp / (4 * np.pi)
    d = np.array([[A * dp * inside + k * xx, k * xy], [k * xy, A * dp * inside + k * yy]])
    w, v = np.linalg.eigh(S0 + d)
    az = np.degrees(np.arctan2(v[0, 1], v[1, 1])) % 180
    print("   %-11s dS %.6f %.6f %.6f MPa; SHmax %.6f Shmin %.6f MPa; azimuth %.6f rotation %.6f deg" % (
        p, d[0, 0] / 1e6, d[1, 1] / 1e6, d[0, 1] / 1e6, w[1] / 1e6, w[0] / 1e6, az, (az - 60 + 90) % 180 - 90))
