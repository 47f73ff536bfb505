"""The stress runner finds the generated-input runner of the build, or says it is not there."""

from __future__ import annotations

import sys
import types

from benchmarks import stress


def test_without_a_generated_input_runner_the_summary_says_so(monkeypatch, capsys):
    for name in stress.FUZZ_MODULES:
        monkeypatch.setitem(sys.modules, name, None)  # importing it raises ImportError
    summary = stress.Summary()
    stress.run_generated_inputs(summary, 10, 1)
    assert capsys.readouterr().out.strip() == "generated inputs: not available in this build"
    assert summary.inputs is None and summary.failures() == 0


def test_the_counts_of_the_generated_input_runner_reach_the_summary(monkeypatch, capsys):
    fake = types.ModuleType("benchmarks.fuzz")
    calls = []

    def run_fuzz(n: int, seed: int) -> dict[str, int]:
        calls.append((n, seed))
        return {"inputs": n, "uncaught_exceptions": 1, "hangs": 0, "non_finite_results": 2}

    fake.run_fuzz = run_fuzz
    monkeypatch.setitem(sys.modules, "tests.fuzz_cases", None)
    monkeypatch.setitem(sys.modules, "benchmarks.fuzz", fake)
    summary = stress.Summary()
    stress.run_generated_inputs(summary, 10_000, 7)
    assert calls == [(10_000, 7)]
    assert (summary.inputs, summary.uncaught_exceptions, summary.non_finite_results) == (10_000, 1, 2)
    assert summary.failures() == 3
    stress.print_summary(summary)
    out = capsys.readouterr().out
    assert "inputs tried                          10000" in out and "all zero: NO" in out
