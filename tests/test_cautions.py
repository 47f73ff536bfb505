"""One cautions text, carried by the JSON results and the text report (the window: tests/gui)."""

import json
import re
from pathlib import Path

from app.text_report import summary_text
from hydraulics.cautions import CAUTIONS_SHORT, CAUTIONS_TEXT
from hydraulics.project_io import load_project
from hydraulics.results_json import solution_to_json_dict
from hydraulics.solve import solve

ROOT = Path(__file__).resolve().parent.parent
SAMPLE = ROOT / "sample_projects" / "river_intake.pumpsketch.json"


def test_the_text_states_the_three_cautions():
    # The cautions the project requires of every result: results preliminary; surge and structural
    # checks need specialist analysis; local codes and a licensed engineer govern.
    for text in (CAUTIONS_TEXT, CAUTIONS_SHORT):
        lowered = text.lower()
        for phrase in ("preliminary", "surge", "structural", "specialist analysis", "local codes",
                       "licensed engineer"):
            assert phrase in lowered, (phrase, text)


def test_the_json_results_carry_the_text_as_it_is():
    data = json.loads(json.dumps(solution_to_json_dict(solve(load_project(SAMPLE)))))
    assert data["cautions"] == CAUTIONS_TEXT


def test_the_text_report_carries_the_whole_text_near_the_top():
    report = summary_text(solve(load_project(SAMPLE)))
    head = report.split("Fluid:")[0]
    assert " ".join(CAUTIONS_TEXT.split()) in " ".join(head.replace("CAUTION:", " ").split())


def test_no_other_module_writes_its_own_cautions():
    # one home: a second copy of a cautions sentence anywhere in the code is a test failure
    home = ROOT / "hydraulics" / "cautions.py"
    sentence = re.compile(r"licensed (professional )?engineer", re.IGNORECASE)
    copies = [path.relative_to(ROOT).as_posix() for package in ("app", "hydraulics")
              for path in (ROOT / package).rglob("*.py")
              if path != home and sentence.search(path.read_text(encoding="utf-8"))]
    assert copies == []
