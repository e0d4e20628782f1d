#!/usr/bin/python3
"""Worked example of docs/references.md §7.4: the stress tensor in ENU from
SHmax = 90 MPa at N060°E, Shmin = 55 MPa, Sv = 75 MPa, resolved on a plane
dipping 80° towards 120°. Prints σn, τ and the critical pore pressure at
μ = 0.6: 64.089229 15.048682 39.008093 (MPa).

Needs Debian's numpy: apt-get install python3-numpy
"""
import numpy as np


def S_enu(SH, Sh, Sv, az):
    a = np.radians(az)
    eH = np.array([np.sin(a), np.cos(a), 0])
    eh = np.array([np.cos(a), -np.sin(a), 0])
    return SH * np.outer(eH, eH) + Sh * np.outer(eh, eh) + Sv * np.diag([0, 0, 1.])


def n_up(dip, dd):
    d, a = np.radians([dip, dd])
    return np.array([np.sin(d) * np.sin(a), np.sin(d) * np.cos(a), np.cos(d)])


S = S_enu(90, 55, 75, 60)
n = n_up(80, 120)
t = S @ n
sn = n @ t
tau = np.linalg.norm(t - sn * n)
print(sn, tau, sn - tau / 0.6)
