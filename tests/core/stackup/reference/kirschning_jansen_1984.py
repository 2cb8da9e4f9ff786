#!/usr/bin/env python3
"""Reference rows for tests/core/stackup/coupled-microstrip.test.ts ("independent re-implementation" block).

Static even/odd-mode Z0 and effective permittivity of a zero-thickness edge-coupled microstrip pair after
M. Kirschning and R. H. Jansen, "Accurate Wide-Range Design Equations for the Frequency-Dependent
Characteristic of Parallel Coupled Microstrip Lines", IEEE Trans. MTT-32, no. 1, 1984, pp. 83-90
(eq. 3: even-mode eps_eff(0); eq. 4: odd-mode eps_eff(0); eqs. 8-9 with Q1..Q10: Z0e(0), Z0o(0)), on top of
E. Hammerstad and O. Jensen, "Accurate Models for Microstrip Computer-Aided Design", IEEE MTT-S Digest 1980,
pp. 407-409 (eqs. 1-5, zero thickness).

What this is and is not: a independent re-implementation of the same published equations, written apart from
core/stackup/ in another language, standard library only. Agreement to 1e-8 shows that the TypeScript code and
this script say the same thing, so a slipped coefficient in either shows. It is not a check of the paper's
accuracy: the test compares the model with a moment-method field solution for that.

Run:  python3 tests/core/stackup/reference/kirschning_jansen_1984.py
Output: one row per point, W/h S/h er Z0e Z0o eps_e eps_o, 10 significant digits; first with the free-space
impedance eta0 in eqs. 8-9, then with the constant written as 377 ohm (both forms are in use).
"""
import math

ETA0 = 376.730313668  # impedance of free space, ohm (CODATA 2018), the constant core/stackup/constants.ts uses


def hj_z01(u, eta):
    """H&J 1980 eq. 1 with f(u) of eq. 2: air-line Z0 of a zero-thickness strip of width ratio u."""
    f = 6.0 + (2.0 * math.pi - 6.0) * math.exp(-((30.666 / u) ** 0.7528))
    return eta / (2.0 * math.pi) * math.log(f / u + math.sqrt(1.0 + 4.0 / (u * u)))


def hj_eps_eff(u, er):
    """H&J 1980 eqs. 3-5."""
    a = 1.0 + math.log((u ** 4 + (u / 52.0) ** 2) / (u ** 4 + 0.432)) / 49.0 + math.log(1.0 + (u / 18.1) ** 3) / 18.7
    b = 0.564 * ((er - 0.9) / (er + 3.0)) ** 0.053
    return (er + 1.0) / 2.0 + (er - 1.0) / 2.0 * (1.0 + 10.0 / u) ** (-a * b)


def kj_static(u, g, er, eta_in_eqs_8_9):
    """Returns (Z0e, Z0o, eps_e, eps_o) for W/h = u, S/h = g."""
    eps0 = hj_eps_eff(u, er)
    z0 = hj_z01(u, ETA0) / math.sqrt(eps0)

    # eq. 3: the single-line eps_eff evaluated at the even-mode width ratio v
    v = u * (20.0 + g * g) / (10.0 + g * g) + g * math.exp(-g)
    eps_e = hj_eps_eff(v, er)

    # eq. 4
    a_o = 0.7287 * (eps0 - (er + 1.0) / 2.0) * (1.0 - math.exp(-0.179 * u))
    b_o = 0.747 * er / (0.15 + er)
    c_o = b_o - (b_o - 0.207) * math.exp(-0.414 * u)
    d_o = 0.593 + 0.694 * math.exp(-0.562 * u)
    eps_o = ((er + 1.0) / 2.0 + a_o - eps0) * math.exp(-c_o * g ** d_o) + eps0

    # Q1..Q10 of eqs. 8-9
    q1 = 0.8695 * u ** 0.194
    q2 = 1.0 + 0.7519 * g + 0.189 * g ** 2.31
    q3 = 0.1975 + (16.6 + (8.4 / g) ** 6) ** -0.387 + math.log(g ** 10 / (1.0 + (g / 3.4) ** 10)) / 241.0
    q4 = 2.0 * q1 / q2 / (math.exp(-g) * u ** q3 + (2.0 - math.exp(-g)) * u ** -q3)
    q5 = 1.794 + 1.14 * math.log(1.0 + 0.638 / (g + 0.517 * g ** 2.43))
    q6 = 0.2305 + math.log(g ** 10 / (1.0 + (g / 5.8) ** 10)) / 281.3 + math.log(1.0 + 0.598 * g ** 1.154) / 5.1
    q7 = (10.0 + 190.0 * g * g) / (1.0 + 82.3 * g ** 3)
    q8 = math.exp(-6.5 - 0.95 * math.log(g) - (g / 0.15) ** 5)
    q9 = math.log(q7) * (q8 + 1.0 / 16.5)
    q10 = q4 - q5 / q2 * math.exp(q6 * math.log(u) / u ** q9)

    # eqs. 8-9: Z0(0) sqrt(eps_eff(0)) / eta, with eta either eta0 or 377 ohm
    ratio = z0 * math.sqrt(eps0) / eta_in_eqs_8_9
    z0e = z0 * math.sqrt(eps0 / eps_e) / (1.0 - ratio * q4)
    z0o = z0 * math.sqrt(eps0 / eps_o) / (1.0 - ratio * q10)
    return z0e, z0o, eps_e, eps_o


ETA0_POINTS = [
    (0.1, 0.1, 18), (0.5, 0.2, 9.8), (1, 0.1, 4.3), (1.25, 1, 4.2), (2, 0.5, 4.3), (1, 1, 9.8),
    (0.2, 2, 12), (5, 3, 2.2), (10, 10, 18),
]
LITERAL_377_POINTS = [(0.1, 0.1, 18), (1, 0.1, 4.3), (1.25, 1, 4.2), (10, 10, 18)]


def row(values):
    return '[' + ', '.join('%.10g' % x for x in values) + '],'


if __name__ == '__main__':
    print('// eta0 in eqs. 8-9')
    for u, g, er in ETA0_POINTS:
        print(row((u, g, er) + kj_static(u, g, er, ETA0)))
    print('// 377 ohm in eqs. 8-9 (Z0e, Z0o only)')
    for u, g, er in LITERAL_377_POINTS:
        print(row((u, g, er) + kj_static(u, g, er, 377.0)[:2]))
