"""Tests of hydraulics.pump_csv: the pump data file reader.

Conversion factors are exact by definition (NIST Special Publication 811, 2008, Appendix
B.8): 1 US gallon = 3.785411784 L, 1 ft = 0.3048 m; 1 hp (550 ft·lbf/s) = 745.69987 W
(NIST SP 811 B.8 gives 7.456999 E+02 W); 1 m³/h = 1/3600 m³/s.
"""

from __future__ import annotations

from dataclasses import replace
from pathlib import Path

import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from hydraulics.pump_csv import PumpCsvError, read_pump_csv, read_pump_csv_with_messages

PUMPS = Path(__file__).resolve().parent.parent / "sample_projects" / "pumps"

GOOD = """# rated_speed [rpm] = 1450
flow [L/s], head [m], efficiency [%], npsh_required [m]
0, 50.0, 0, 2.0
10, 48.0, 55.0, 2.2
20, 42.0, 75.0, 2.8
30, 32.0, 70.0, 3.9
"""


def _error(text: str, **kwargs) -> PumpCsvError:
    with pytest.raises(PumpCsvError) as info:
        read_pump_csv(text, "P", "test", **kwargs)
    return info.value


# ---------------------------------------------------------------- good files
def test_reads_columns_in_si():
    pump = read_pump_csv(GOOD, "P", "test")
    assert pump.flow_m3_s == pytest.approx((0.0, 0.01, 0.02, 0.03), rel=1e-15)  # 1 L = 1e-3 m³ (SI definition)
    assert pump.head_m == (50.0, 48.0, 42.0, 32.0)
    assert pump.efficiency == pytest.approx((0.0, 0.55, 0.75, 0.70), rel=1e-15)  # percent / 100
    assert pump.npsh_required_m == (2.0, 2.2, 2.8, 3.9)
    assert pump.shaft_power_w == ()
    assert pump.rated_speed_rpm == 1450.0
    assert (pump.pump_id, pump.name) == ("P", "test")


def test_us_units_convert_with_exact_factors():
    text = """# rated_speed [rpm] = 1780
flow [gpm], head [ft], power [hp], efficiency [-]
0, 100, 10, 0.0
200, 95, 14, 0.5
400, 80, 18, 0.7
600, 55, 21, 0.72
"""
    pump = read_pump_csv(text, "P", "test")
    gpm = 3.785411784e-3 / 60.0  # NIST SP 811 B.8: US gallon exact; per minute
    assert pump.flow_m3_s[1] == pytest.approx(200 * gpm, rel=1e-12)
    assert pump.head_m[1] == pytest.approx(95 * 0.3048, rel=1e-12)  # NIST SP 811: 1 ft = 0.3048 m exactly
    assert pump.shaft_power_w[1] == pytest.approx(14 * 745.69987, rel=1e-7)  # NIST SP 811: 1 hp = 745.69987 W
    assert pump.efficiency == (0.0, 0.5, 0.7, 0.72)  # fraction column kept as is


def test_power_in_kw_and_flow_in_m3_per_hour():
    text = "# rated_speed [rpm] = 1480\nflow [m3/h], head [m], power [kW]\n0, 20, 3.0\n36, 18, 4.0\n72, 14, 5.0\n"
    pump = read_pump_csv(text, "P", "test")
    assert pump.flow_m3_s == pytest.approx((0.0, 0.01, 0.02), rel=1e-12)  # 36 m³/h = 36/3600 m³/s
    assert pump.shaft_power_w == pytest.approx((3000.0, 4000.0, 5000.0), rel=1e-12)  # 1 kW = 1000 W
    assert pump.efficiency == ()


def test_semicolon_with_decimal_comma():
    text = ("# rated_speed [rpm] = 1480,0\nflow [L/s]; head [m]; efficiency [%]\n"
            "0; 40,5; 0\n12,5; 38,25; 50,5\n25; 33; 70\n")
    pump = read_pump_csv(text, "P", "test")
    assert pump.flow_m3_s == pytest.approx((0.0, 0.0125, 0.025), rel=1e-15)
    assert pump.head_m == (40.5, 38.25, 33.0)
    assert pump.efficiency == pytest.approx((0.0, 0.505, 0.70), rel=1e-15)
    assert pump.rated_speed_rpm == 1480.0


def test_semicolon_with_decimal_point_also_reads():
    text = "# rated_speed [rpm] = 1480\nflow [L/s]; head [m]\n0; 40.5\n10; 38.0\n20; 31.5\n"
    assert read_pump_csv(text, "P", "test").head_m == (40.5, 38.0, 31.5)


def test_comments_blank_lines_and_column_order():
    text = "\n# a note\n\n# rated_speed [rpm] = 960\nhead [m], flow [L/s]\n# mid-file note\n30, 0\n\n28, 10\n22, 20\n"
    pump = read_pump_csv(text, "P", "test")
    assert pump.flow_m3_s == pytest.approx((0.0, 0.01, 0.02))
    assert pump.head_m == (30.0, 28.0, 22.0)
    assert pump.rated_speed_rpm == 960.0


def test_impeller_diameter_metadata():
    text = "# rated_speed [rpm] = 2900\n# impeller_diameter [mm] = 248\nflow [L/s], head [m]\n0, 9\n1, 8\n2, 6\n"
    assert read_pump_csv(text, "P", "t").impeller_diameter_m == pytest.approx(0.248, rel=1e-15)


def test_unsorted_rows_are_sorted_with_a_message():
    text = ("# rated_speed [rpm] = 1450\nflow [L/s], head [m], efficiency [%]\n"
            "20, 42, 75\n0, 50, 0\n10, 48, 55\n30, 32, 70\n")
    pump, messages = read_pump_csv_with_messages(text, "P", "test")
    assert pump.flow_m3_s == pytest.approx((0.0, 0.01, 0.02, 0.03))
    assert pump.head_m == (50.0, 48.0, 42.0, 32.0)
    assert pump.efficiency == pytest.approx((0.0, 0.55, 0.75, 0.70))  # rows move together
    assert any("sorted" in m for m in messages)


def test_sorted_file_has_no_messages():
    assert read_pump_csv_with_messages(GOOD, "P", "test")[1] == ()


def test_three_points_accepted_with_a_recommendation():
    text = "# rated_speed [rpm] = 1450\nflow [L/s], head [m]\n0, 50\n10, 46\n20, 38\n"
    pump, messages = read_pump_csv_with_messages(text, "P", "test")
    assert len(pump.flow_m3_s) == 3
    assert any("4 or more" in m for m in messages)


def test_rated_speed_argument_overrides_file_with_message():
    pump, messages = read_pump_csv_with_messages(GOOD, "P", "test", rated_speed_rpm=1480.0)
    assert pump.rated_speed_rpm == 1480.0
    assert any("overrides" in m for m in messages)


def test_rated_speed_argument_without_metadata():
    text = "flow [L/s], head [m]\n0, 50\n10, 46\n20, 38\n"
    assert read_pump_csv(text, "P", "t", rated_speed_rpm=1450.0).rated_speed_rpm == 1450.0


def test_reads_from_path(tmp_path):
    path = tmp_path / "pump.csv"
    path.write_text(GOOD, encoding="utf-8")
    from_path, from_name, from_text = (read_pump_csv(path, "P", "t"), read_pump_csv(str(path), "P", "t"),
                                       read_pump_csv(GOOD, "P", "t"))
    assert from_path == from_name
    assert from_path.source_file == "pump.csv" and from_text.source_file == ""  # the file's name is kept
    assert replace(from_path, source_file="") == from_text


def test_the_comment_lines_are_kept_with_the_pump_as_its_provenance():
    text = "# Test curve from the works test, 2026-03 (invented)\n# rated_speed [rpm] = 1450\n" + \
        "flow [L/s], head [m]\n0, 50\n10, 46\n20, 38\n"
    pump = read_pump_csv(text, "P", "t")
    assert pump.source_comments == ("Test curve from the works test, 2026-03 (invented)", "rated_speed [rpm] = 1450")


def test_missing_file_raises_file_not_found(tmp_path):
    with pytest.raises(FileNotFoundError):
        read_pump_csv(tmp_path / "absent.csv", "P", "t")


# ---------------------------------------------------------------- errors name line and column
def test_non_numeric_cell_names_line_and_column():
    err = _error(GOOD.replace("10, 48.0", "10, abc"))
    assert (err.line, err.column, err.column_name) == (4, 2, "head")
    assert "line 4, column 2 (head)" in str(err) and "'abc' is not a number" in str(err)


def test_negative_value_names_line_and_column():
    err = _error(GOOD.replace("20, 42.0, 75.0, 2.8", "20, 42.0, 75.0, -2.8"))
    assert (err.line, err.column) == (5, 4)
    assert "negative" in str(err)


def test_missing_cell_names_line_and_column():
    err = _error(GOOD.replace("30, 32.0, 70.0, 3.9", "30, 32.0, 70.0"))
    assert (err.line, err.column, err.column_name) == (6, 4, "npsh_required")
    assert "missing" in str(err)


def test_empty_cell_names_line_and_column():
    err = _error(GOOD.replace("10, 48.0, 55.0", "10, , 55.0"))
    assert (err.line, err.column) == (4, 2)


def test_extra_cells_are_refused():
    err = _error(GOOD.replace("10, 48.0, 55.0, 2.2", "10, 48.0, 55.0, 2.2, 9"))
    assert (err.line, err.column) == (4, 5)


def test_decimal_comma_with_comma_separator_is_refused_with_a_hint():
    err = _error(GOOD.replace("20, 42.0, 75.0, 2.8", "20, 42,5, 75.0, 2.8"))
    assert err.line == 5
    assert "';'" in str(err)


def test_non_finite_values_are_refused():
    err = _error(GOOD.replace("10, 48.0", "10, nan"))
    assert (err.line, err.column) == (4, 2)
    err = _error(GOOD.replace("10, 48.0", "10, inf"))
    assert (err.line, err.column) == (4, 2)


def test_duplicated_flow_is_refused():
    err = _error(GOOD.replace("20, 42.0", "10, 42.0"))
    assert (err.line, err.column, err.column_name) == (5, 1, "flow")
    assert "lines 4 and 5" in str(err)


def test_too_few_points():
    err = _error("# rated_speed [rpm] = 1450\nflow [L/s], head [m]\n0, 50\n10, 46\n")
    assert "at least 3" in str(err)


def test_header_errors_name_the_column():
    assert _error("flow [L/s], head\n0, 5\n1, 4\n2, 3\n", rated_speed_rpm=1450.0).column == 2  # no unit
    err = _error("flow [L/s], pressure [m]\n0, 5\n1, 4\n2, 3\n", rated_speed_rpm=1450.0)
    assert (err.line, err.column) == (1, 2) and "unknown column" in str(err)
    err = _error("flow [L/s], head [kg]\n0, 5\n1, 4\n2, 3\n", rated_speed_rpm=1450.0)
    assert (err.line, err.column) == (1, 2) and "length unit" in str(err)
    err = _error("flow [m], head [m]\n0, 5\n1, 4\n2, 3\n", rated_speed_rpm=1450.0)
    assert (err.line, err.column) == (1, 1)
    err = _error("flow [L/s], head [m], head [ft]\n0, 5, 1\n1, 4, 1\n2, 3, 1\n", rated_speed_rpm=1450.0)
    assert err.column == 3 and "twice" in str(err)
    err = _error("flow [L/s], efficiency [%]\n0, 5\n1, 4\n2, 3\n", rated_speed_rpm=1450.0)
    assert "head" in str(err) and err.line == 1


def test_efficiency_fraction_above_one_suggests_percent():
    err = _error("flow [L/s], head [m], efficiency [-]\n0, 5, 0\n1, 4, 55\n2, 3, 70\n", rated_speed_rpm=1450.0)
    assert (err.line, err.column) == (3, 3) and "[%]" in str(err)


def test_no_rated_speed_is_refused():
    err = _error("flow [L/s], head [m]\n0, 5\n1, 4\n2, 3\n")
    assert "rated_speed" in str(err)


def test_unknown_setting_and_bad_setting_value():
    err = _error("# rated_sped [rpm] = 1450\nflow [L/s], head [m]\n0, 5\n1, 4\n2, 3\n")
    assert err.line == 1 and "unknown setting" in str(err)
    err = _error("# rated_speed [rpm] = fast\nflow [L/s], head [m]\n0, 5\n1, 4\n2, 3\n")
    assert err.line == 1
    err = _error("# rated_speed [m] = 1450\nflow [L/s], head [m]\n0, 5\n1, 4\n2, 3\n")
    assert err.line == 1


def test_no_header():
    assert "header" in str(_error("# only comments\n\n# here\n"))


@settings(max_examples=60, deadline=None)
@given(st.lists(st.text(alphabet="0123456789.,;-# []abflowhedLsm%\t", max_size=30), min_size=1, max_size=8))
def test_arbitrary_text_raises_only_pump_csv_error(lines):
    text = "\n".join(lines) + "\n"
    try:
        read_pump_csv_with_messages(text, "P", "fuzz", rated_speed_rpm=1450.0)
    except PumpCsvError as exc:
        assert str(exc)


# ---------------------------------------------------------------- sample files (invented demo data)
@pytest.mark.parametrize("name", ["booster_bp80.csv", "sewage_sw150.csv", "intake_rw250.csv"])
def test_sample_files_are_marked_invented_and_read_cleanly(name):
    text = (PUMPS / name).read_text(encoding="utf-8")
    assert "INVENTED DEMONSTRATION DATA" in text and "fictitious" in text
    pump, messages = read_pump_csv_with_messages(PUMPS / name, "X", name)
    assert messages == ()
    assert 6 <= len(pump.flow_m3_s) <= 9
    assert len(pump.efficiency) == len(pump.npsh_required_m) == len(pump.flow_m3_s)


def test_sample_sewage_file_uses_cubic_metres_per_hour_and_decimal_comma():
    text = (PUMPS / "sewage_sw150.csv").read_text(encoding="utf-8")
    assert "flow [m3/h];" in text and "32,6" in text
    pump = read_pump_csv(PUMPS / "sewage_sw150.csv", "SW150", "sewage")
    assert pump.rated_speed_rpm == 1480.0
    i = pump.flow_m3_s.index(pytest.approx(0.06, rel=1e-12))  # 216 m³/h = 216/3600 m³/s
    assert pump.head_m[i] == 32.6 and pump.efficiency[i] == pytest.approx(0.687)  # the file's row "216; 32,6; 68,7"


def test_sample_booster_and_intake_units():
    booster = read_pump_csv(PUMPS / "booster_bp80.csv", "BP80", "booster")
    assert booster.rated_speed_rpm == 2900.0 and booster.impeller_diameter_m == pytest.approx(0.248)
    assert booster.flow_m3_s[4] == pytest.approx(0.035) and booster.efficiency[4] == pytest.approx(0.76)
    intake = read_pump_csv(PUMPS / "intake_rw250.csv", "RW250", "intake")
    assert intake.rated_speed_rpm == 1480.0
    assert intake.flow_m3_s[4] == pytest.approx(0.150) and intake.efficiency[4] == pytest.approx(0.821)
