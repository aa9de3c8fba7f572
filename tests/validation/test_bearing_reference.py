"""Web bearing, tube crushing and core indentation, recomputed clause by clause, and patch
loading against a design guide's published worked example (at the end of this file: its
intermediate values m1 and m2; its final resistance is on a sheet not at hand).

Otherwise each check is an independent
recomputation in plain arithmetic, written out in the order of the source's clauses:
EN 1993-1-5:2006 sec. 6 eq. 6.1-6.13 (from memory) for an IPE 300 outline (EN 10365
dimensions without the root fillets) in S355 (f_y 355 MPa, EN 10025-2; E 210 GPa,
EN 1993-1-1 3.2.6); DeRuntz & Hodge (1963) for the ring; Steeves & Fleck (2004) for the
sandwich. Tolerance 1e-9 (the same arithmetic), except where stated.
"""

from __future__ import annotations

import math

import numpy as np
import pytest

from service.core.sections import bearing

IPE_300 = {"depth": 0.300, "flange_width": 0.150, "flange_thickness": 0.0107,
           "web_thickness": 0.0071}
E, FY = 210e9, 355e6


def test_ipe_300_within_the_span_step_by_step():
    hw, tw, bf, tf, ss = 0.300 - 2 * 0.0107, 0.0071, 0.150, 0.0107, 0.050
    kf = 6.0                                           # eq. 6.6, a -> infinity
    fcr = 0.9 * kf * E * tw**3 / hw                    # eq. 6.5
    m1 = FY * bf / (FY * tw)                           # eq. 6.8
    m2 = 0.02 * (hw / tf) ** 2                         # eq. 6.9, lambda_F > 0.5 assumed
    ly = ss + 2 * tf * (1 + math.sqrt(m1 + m2))        # eq. 6.10
    lam = math.sqrt(ly * tw * FY / fcr)                # eq. 6.4
    assert lam > 0.5                                   # so m2 stands
    chi = min(0.5 / lam, 1.0)                          # eq. 6.3
    expected = FY * chi * ly * tw                      # eq. 6.1, 6.2 without gamma_M1
    # about 426 kN: F_cr 1457 kN, l_y 197 mm, lambda_F 0.584
    assert fcr == pytest.approx(1.457e6, rel=1e-3) and ly == pytest.approx(0.1974, rel=1e-3)
    ours = bearing.i_section_web_bearing(IPE_300, E, FY, ss)
    assert float(ours) == pytest.approx(expected, rel=1e-9)
    assert float(ours) == pytest.approx(425.7e3, rel=2e-3)


def test_ipe_300_at_an_end_support_step_by_step():
    hw, tw, bf, tf, ss = 0.300 - 2 * 0.0107, 0.0071, 0.150, 0.0107, 0.050
    kf = min(2 + 6 * ss / hw, 6.0)                     # eq. 6.6, type (c), c = 0
    fcr = 0.9 * kf * E * tw**3 / hw
    m1 = bf / tw
    le = min(kf * E * tw**2 / (2 * FY * hw), ss)       # eq. 6.13
    for m2 in (0.02 * (hw / tf) ** 2, 0.0):
        ly = min(le + tf * math.sqrt(m1 / 2 + (le / tf) ** 2 + m2),   # eq. 6.12
                 le + tf * math.sqrt(m1 + m2))                         # eq. 6.11
        lam = math.sqrt(ly * tw * FY / fcr)
        if m2 == 0.0 or lam > 0.5:
            break
    expected = FY * min(0.5 / lam, 1.0) * ly * tw
    ours = bearing.i_section_web_bearing(IPE_300, E, FY, ss, at_end=True)
    assert float(ours) == pytest.approx(expected, rel=1e-9)
    assert float(ours) < float(bearing.i_section_web_bearing(IPE_300, E, FY, ss))


def test_patch_loading_limits():
    # A stocky web yields over l_y (chi_F = 1); a slender one keeps chi_F = 0.5 / lambda_F,
    # so its resistance is 0.5 sqrt(l_y t_w f_y F_cr), growing as t_w^2 at fixed l_y.
    thick = dict(IPE_300, web_thickness=0.03)
    m1 = 0.150 / 0.03
    ly = 0.05 + 2 * 0.0107 * (1 + math.sqrt(m1))       # lambda_F < 0.5: m2 = 0
    assert float(bearing.i_section_web_bearing(thick, E, FY, 0.05)) == pytest.approx(
        FY * ly * 0.03, rel=1e-9)
    resist = bearing.i_section_web_bearing(
        dict(IPE_300, web_thickness=np.array([0.002, 0.003])), E, FY, 0.0)
    assert resist.shape == (2,)
    # both slender (chi_F < 1): the ratio is (3/2)^2 times the ratio of their l_y
    ly = [2 * 0.0107 * (1 + math.sqrt(0.150 / tw + 0.02 * ((0.300 - 0.0214) / 0.0107) ** 2))
          for tw in (0.002, 0.003)]
    assert resist[1] / resist[0] == pytest.approx(2.25 * math.sqrt(ly[1] / ly[0]), rel=1e-9)


def test_box_is_two_webs_with_half_the_flange_each():
    dims = {"depth": 0.2, "width": 0.1, "wall": 0.004}
    one_web = bearing.patch_loading_resistance(0.2 - 0.008, 0.004, 0.05, 0.004, E, FY, 0.03,
                                               False)
    assert float(bearing.rectangular_tube_web_bearing(dims, E, FY, 0.03)) == pytest.approx(
        2 * float(one_web), rel=1e-12)


def test_round_tube_ring_collapse_by_hand():
    # Four hinges of f_y t^2 / 4 per unit length: P = 4 M_0 s / R (DeRuntz & Hodge 1963).
    dims = {"outer_diameter": 0.1, "wall": 0.003}
    radius = (0.1 - 0.003) / 2
    expected = 4 * (FY * 0.003**2 / 4) * 0.04 / radius
    assert float(bearing.round_tube_crushing(dims, FY, 0.04)) == pytest.approx(expected, 1e-12)
    assert float(bearing.round_tube_crushing(dims, FY, 0.0)) == 0.0


def test_sandwich_indentation_by_hand():
    # Steeves & Fleck (2004): P = b a sigma_c + 2 b t sqrt(sigma_f sigma_c) for ductile faces.
    dims = {"width": 0.3, "core_thickness": 0.02, "face_thickness": 0.0008}
    sigma_f, sigma_c, a = 250e6, 1.5e6, 0.025
    ductile = 0.3 * a * sigma_c + 2 * 0.3 * 0.0008 * math.sqrt(sigma_f * sigma_c)
    assert float(bearing.sandwich_indentation(dims, sigma_f, sigma_c, a)) == pytest.approx(
        ductile, rel=1e-12)
    brittle = bearing.sandwich_indentation(dims, sigma_f, sigma_c, a, brittle_faces=True)
    assert float(brittle) < ductile


def test_a_brittle_flange_spreads_the_load_through_its_thickness_alone():
    """Our reading for a flange without plastic hinges (m1 = m2 = 0 in EN 1993-1-5 6.5):
    l_y = s_s + 2 t_f within the span (eq. 6.10 with m1 = m2 = 0) and l_e + t_f at an end
    (the 1:1 spread to the one side), so a knife edge at an end still bears; the rest of
    the clause as written (eq. 6.1-6.5, 6.13 type c)."""
    hw, tw, tf = 0.300 - 2 * 0.0107, 0.0071, 0.0107
    for at_end, length in ((False, 2 * tf), (True, None)):
        kf = 2.0 if at_end else 6.0                        # eq. 6.6, s_s = 0
        if at_end:
            le = min(kf * E * tw**2 / (2 * FY * hw), 0.0)  # eq. 6.13: l_e <= s_s + c = 0
            length = le + tf
        fcr = 0.9 * kf * E * tw**3 / hw
        lam = math.sqrt(length * tw * FY / fcr)
        expected = FY * min(0.5 / lam, 1.0) * length * tw
        ours = bearing.i_section_web_bearing(IPE_300, E, FY, 0.0, at_end, False)
        assert float(ours) == pytest.approx(expected, rel=1e-9)
        assert float(ours) > 0.0


# --- published worked cases ------------------------------------------------------------------


def test_m1_m2_of_the_steel_buildings_in_europe_worked_example():
    """Steel Buildings in Europe, Multi-Storey Steel Buildings, Part 8: Design software -
    section capacity (CTICM and SCI, 2010), Appendix A, Worked Example 5 "Web Resistance",
    sheet 1 of 2, p. 8-27 (read at infosteel.be/images/Steel-Buildings-in-Europe/MSB08/36):
    IPE 500 in S355, b_f = 200 mm, t_w = 10.2 mm, t_f = 16 mm, h_w = 468 mm, printed
    m1 = 200 / 10.2 = 19,6 and m2 = 0.02 (468 / 16)^2 = 17,11 (EN 1993-1-5 eq. 6.8, 6.9, the
    flange and web of one steel). Its load is a type (c) near an end with c = 10 mm and
    s_s = 100 mm; our end support takes c = 0, and its final F_Rd is on sheet 2 of 2, which
    the stored copy does not hold, so only the intermediate values are compared. Tolerance:
    half a unit of the last printed digit."""
    m1, m2 = bearing.yield_length_parameters(0.468, 0.0102, 0.200, 0.016)
    assert float(m1) == pytest.approx(19.6, abs=0.05)
    assert float(m2) == pytest.approx(17.11, abs=0.005)


def test_loads_within_the_span_and_at_an_end_in_one_array():
    """A mixed ``at_end`` array gives each element its own type's resistance, to the bit
    (each type's formula is evaluated only where asked for)."""
    webs = np.array([0.0071, 0.004, 0.012])
    hinges = np.array([True, False, True])
    lengths = np.array([0.05, 0.0, 0.3])
    at_end = np.array([True, False, True])
    mixed = bearing.patch_loading_resistance(0.2786, webs, 0.150, 0.0107, 210e9, 355e6,
                                             lengths, at_end, hinges)
    alone = [float(bearing.patch_loading_resistance(0.2786, webs[k], 0.150, 0.0107, 210e9,
                                                    355e6, lengths[k], at_end[k], hinges[k]))
             for k in range(3)]
    assert mixed.tolist() == alone
