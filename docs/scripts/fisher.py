#!/usr/bin/python3
"""Fisher distribution check values of docs/references.md §1.3: for each
concentration kappa, E[cos θ], Var[cos θ], E[θ] (degrees, by quadrature)
and the cone angles θ50, θ63, θ95, θ99 (degrees, closed-form quantile).

Needs Debian's numpy and scipy: apt-get install python3-numpy python3-scipy
"""
import numpy as np
from scipy import integrate


def quant(P, k):
    return np.degrees(np.arccos(1 + np.log1p(-P * (-np.expm1(-2 * k))) / k))


for k in [5, 10, 20, 50, 100]:
    pdf = lambda t: k * np.sin(t) * np.exp(k * (np.cos(t) - 1)) / (1 - np.exp(-2 * k))
    Eth = np.degrees(integrate.quad(lambda t: t * pdf(t), 0, np.pi, limit=400)[0])
    print(k, 1 / np.tanh(k) - 1 / k, 1 / k**2 - 1 / np.sinh(k)**2, Eth,
          [quant(P, k) for P in (0.5, 1 - np.exp(-1), 0.95, 0.99)])
