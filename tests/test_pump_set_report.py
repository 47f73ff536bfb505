"""The installed pumps in the text report and the `solve` command's text: the list, each pump's share, findings."""

from __future__ import annotations

import subprocess
import sys
from dataclasses import replace

import pytest

from app.text_report import summary_text
from hydraulics.cautions import CAUTIONS_TEXT
from hydraulics.number_format import fixed_decimals
from hydraulics.solve import solve
from tests.installed_pump_fakes import HILLTOP, ROOT, hilltop, jp40, with_assist, write

WEAK_PUMP_CODES = ("pump_held_shut", "pump_below_minimum_flow")


def _solve_cli(path) -> subprocess.CompletedProcess:
    return subprocess.run([sys.executable, "-m", "app", "solve", str(path)], capture_output=True, text=True,
                          cwd=ROOT, timeout=120)


@pytest.fixture(scope="module")
def assisted():
    return solve(with_assist(hilltop(), jp40()))


def test_the_report_lists_every_installed_pump_with_its_role_and_control(assisted):
    text = summary_text(assisted)
    section = text[text.index("Installed pumps"):]
    lines = section.splitlines()
    assert any(line.split()[:2] == ["P1", "BP80"] and "duty" in line and "variable speed 88–100 %" in line
               for line in lines)  # the sample's arrangement: 88–100 % on a drive
    assert any(line.split()[:2] == ["P2", "BP80"] and "standby" in line for line in lines)
    assert any(line.split()[:2] == ["P3", "JP40"] and "assist" in line and "fixed speed 100 %" in line
               for line in lines)
    assert "run sequence (duty pumps, then assist pumps as the flow needs them): P1; P1+P3" in text
    assert text.startswith("PumpSketch results") and "CAUTION:" in text


def test_the_report_gives_each_running_pumps_share_at_the_sets(assisted):
    text = summary_text(assisted)
    point = next(p for p in assisted.pump_set.points
                 if (p.static, p.pipe, p.speed, p.basis) == ("max", "aged", "highest speed", "run sequence"))
    title = f"P1+P3, max static, aged pipe, highest speed: station {fixed_decimals(point.flow_m3_s * 1000, 1)} L/s"
    assert title in text
    block = text[text.index(title):].splitlines()[1:5]
    p3 = next(s for s in point.shares if s.tag == "P3")
    row = next(line for line in block if line.strip().startswith("P3 (assist)"))
    assert fixed_decimals(p3.flow_m3_s * 1000, 1) in row.split() and fixed_decimals(p3.head_m, 1) in row.split()
    assert "(P1 out of service, standby P2 running)" in text


def test_the_report_shows_a_pump_held_shut_and_its_finding():
    held = solve(with_assist(hilltop(), jp40(-8.0)))  # 76 m shut-off: below the ~83 m manifold head
    text = summary_text(held)
    assert "held shut by its check valve" in text
    assert "[CRITICAL] pump_held_shut:" in text


def test_a_sample_without_other_pumps_lists_its_pumps_and_no_sets():
    text = summary_text(solve(hilltop()))
    assert "Installed pumps" in text
    assert "run sequence (duty pumps, then assist pumps as the flow needs them): P1\n" in text
    assert "Pumps of different models together" not in text


def test_the_solve_command_shows_the_weaker_assist_pump_and_its_finding(tmp_path):
    path = write(with_assist(hilltop(), jp40()), tmp_path / "assisted.pumpsketch.json")
    result = _solve_cli(path)
    assert result.returncode == 0, result.stderr
    out = result.stdout
    assert "Installed pumps" in out and "Pumps of different models together" in out
    assert "[WARNING] pump_below_minimum_flow:" in out
    assert "P3 is pushed back towards shut-off" in out
    assert " ".join(CAUTIONS_TEXT.split()[:6]) in " ".join(out.split())


def test_the_solve_command_on_a_clean_sample_raises_no_weak_pump_finding():
    result = _solve_cli(HILLTOP)
    assert result.returncode == 0, result.stderr
    assert not any(code in result.stdout for code in WEAK_PUMP_CODES)


def test_matched_pumps_raise_no_weak_pump_finding(tmp_path):
    base = hilltop()
    fixed = replace(base, arrangement=replace(base.arrangement, variable_speed=False))
    same = with_assist(fixed, replace(base.pump("BP80"), pump_id="BP80b", name="BP80 second (invented)"))
    result = _solve_cli(write(same, tmp_path / "matched.pumpsketch.json"))
    assert result.returncode == 0, result.stderr
    assert "P1+P3" in result.stdout
    assert not any(code in result.stdout for code in WEAK_PUMP_CODES)


def test_the_report_gives_the_motor_of_a_pump_beside_the_arrangement(assisted):
    text = summary_text(assisted)
    motor = assisted.pump_set.motors[0].motor
    assert "Motor of P3 (JP40 jockey (invented)) (fixed speed 100 %" in text
    section = text[text.index("Motor of P3"):]
    # the shaft power it needs at its points, in kW as the report shows it (1 kW = 1000 W)
    assert f"operating points up to {fixed_decimals(motor.max_shaft_power_at_points_w / 1000.0, 1)} kW" in section
