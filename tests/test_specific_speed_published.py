"""Pump and suction specific speeds against published worked examples.

Each example is given in US customary units (rpm, US gpm, ft) with its published result,
rounded there to a whole number.  The inputs are converted to SI with the exact unit
definitions (1 US gal = 3.785 411 784 L, 1 ft = 0.3048 m; NIST SP 811, Appendix B.8), the
engine's SI form is evaluated and turned into the US form by ``US_PER_SI``; the result must
round to the published figure (within half a unit of its last digit).

Sources (inputs and results only, quoted as facts):

* L. Bachus and A. Custodio, *Know and Understand Centrifugal Pumps*, Elsevier (2003; 1st ed.
  — publisher and edition from memory; verify), chapter 6 "Pump Classification", p. 85: three
  suction specific speed examples read at the best-efficiency point; the dual-suction example
  takes half the flow, per impeller eye.
* "Suction specific speed", centrifugalpump.com (Suction_specific_speed.html): the example of
  a double-suction pump.
* "Application of specific speed in new pump design", centrifugalpump.org (NS_newdesign.html):
  the pump specific speed of a single-stage pump.
"""

import pytest

from hydraulics.specific_speed import US_PER_SI, specific_speed, suction_specific_speed

GPM_M3_S = 3.785411784e-3 / 60.0  # one US gallon per minute in m³/s (NIST SP 811, App. B.8: exact)
FT_M = 0.3048  # one international foot in m (NIST SP 811, App. B.8: exact)
ROUNDED = 0.5  # the published results are whole numbers


@pytest.mark.parametrize("speed_rpm, flow_gpm, npshr_ft, eyes, published_nss", [
    # Bachus & Custodio, Know and Understand Centrifugal Pumps, ch. 6, p. 85, example 1:
    # end-suction single-stage pump (ANSI), cooling water: 1750 rpm, 600 gpm, NPSHr 7 ft at BEP -> Nss 9,961
    (1750.0, 600.0, 7.0, 1, 9961.0),
    # ibid., example 2: end-suction single-stage pump (API 610), kerosene: 3500 rpm, 1200 gpm, NPSHr 30 ft
    # -> Nss 9,458
    (3500.0, 1200.0, 30.0, 1, 9458.0),
    # ibid., example 3: dual-suction impeller, single stage (fire water): 1780 rpm, 4500 gpm (2250 gpm per
    # eye), NPSHr 20 ft -> Nss 8,928
    (1780.0, 4500.0, 20.0, 2, 8928.0),
    # centrifugalpump.com, "Suction specific speed", example: double-suction pump at 3560 rpm, BEP 800 gpm
    # (400 gpm per eye), NPSHR3 18 ft -> Nss 8148
    (3560.0, 800.0, 18.0, 2, 8148.0),
])
def test_suction_specific_speed_matches_the_published_examples(speed_rpm, flow_gpm, npshr_ft, eyes, published_nss):
    s_si = suction_specific_speed(speed_rpm, flow_gpm * GPM_M3_S, npshr_ft * FT_M, impeller_eyes=eyes)
    assert s_si * US_PER_SI == pytest.approx(published_nss, abs=ROUNDED)


def test_counting_the_whole_flow_of_a_dual_suction_impeller_would_miss_the_published_value():
    # Bachus & Custodio, ch. 6, p. 85, example 3 (as above): the published 8,928 is per impeller eye;
    # one eye taking all 4500 gpm would give √2 times as much, about 12,626
    whole = suction_specific_speed(1780.0, 4500.0 * GPM_M3_S, 20.0 * FT_M, impeller_eyes=1) * US_PER_SI
    assert whole == pytest.approx(8928.0 * 2**0.5, rel=1e-4)
    assert abs(whole - 8928.0) > 3000.0


def test_pump_specific_speed_matches_the_published_example():
    # centrifugalpump.org, "Application of specific speed in new pump design": single-stage pump rated
    # 95,000 gpm at 1500 ft and 1780 rpm -> Ns 2,276 (rpm, gpm, ft)
    n_s = specific_speed(1780.0, 95000.0 * GPM_M3_S, 1500.0 * FT_M)
    assert n_s * US_PER_SI == pytest.approx(2276.0, abs=ROUNDED)
    # the same in SI units (rpm, m³/s, m): 2276 / 51.645 ≈ 44.07 (the factor by exact arithmetic,
    # tests/test_specific_speed.py)
    assert n_s == pytest.approx(2276.0 / 51.645, abs=ROUNDED / 51.645 + 1e-3)
