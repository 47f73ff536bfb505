"""Saving keeps the previous version as a backup and removes what an interrupted save left behind."""

from __future__ import annotations

import os
from dataclasses import replace

import pytest

from hydraulics.project_io import (
    backup_path,
    load_project,
    new_project,
    remove_stale_temporaries,
    save_project,
)

FIRST = new_project()
SECOND = replace(FIRST, name="second version")
THIRD = replace(FIRST, name="third version")


def _names(folder) -> list[str]:
    return sorted(p.name for p in folder.iterdir())


def test_the_first_save_makes_no_backup(tmp_path):
    path = tmp_path / "p.pumpsketch.json"
    save_project(FIRST, path)
    assert _names(tmp_path) == ["p.pumpsketch.json"]


def test_each_save_keeps_the_version_it_replaces_one_generation(tmp_path):
    path = tmp_path / "p.pumpsketch.json"
    save_project(FIRST, path)
    save_project(SECOND, path)
    assert backup_path(path).name == "p.pumpsketch.json.bak"
    assert load_project(path) == SECOND
    assert load_project(backup_path(path)) == FIRST
    save_project(THIRD, path)
    assert load_project(path) == THIRD
    assert load_project(backup_path(path)) == SECOND  # one generation: the first version is gone
    assert _names(tmp_path) == ["p.pumpsketch.json", "p.pumpsketch.json.bak"]


def test_the_backup_is_a_copy_where_hard_links_are_not_possible(tmp_path, monkeypatch):
    path = tmp_path / "p.pumpsketch.json"
    save_project(FIRST, path)

    def no_links(*_args, **_kwargs):
        raise OSError("hard links not supported here")

    monkeypatch.setattr(os, "link", no_links)
    save_project(SECOND, path)
    assert load_project(backup_path(path)) == FIRST
    assert load_project(path) == SECOND
    assert _names(tmp_path) == ["p.pumpsketch.json", "p.pumpsketch.json.bak"]


def test_a_failed_backup_fails_the_save_and_leaves_the_file_and_the_folder_as_they_were(tmp_path, monkeypatch):
    path = tmp_path / "p.pumpsketch.json"
    save_project(FIRST, path)
    save_project(SECOND, path)
    before = path.read_bytes(), backup_path(path).read_bytes()
    real_replace = os.replace

    def failing_replace(src, dst):
        if str(dst).endswith(".bak"):
            raise OSError("disk full")
        real_replace(src, dst)

    monkeypatch.setattr(os, "replace", failing_replace)
    with pytest.raises(OSError, match="disk full"):
        save_project(THIRD, path)
    assert (path.read_bytes(), backup_path(path).read_bytes()) == before
    assert _names(tmp_path) == ["p.pumpsketch.json", "p.pumpsketch.json.bak"]


def test_a_save_stopped_after_the_backup_step_is_completed_by_the_next_save(tmp_path):
    # The state a kill between the backup link and the rename leaves: the backup is the same file as the project.
    path = tmp_path / "p.pumpsketch.json"
    save_project(FIRST, path)
    os.link(path, backup_path(path))
    save_project(SECOND, path)
    assert load_project(path) == SECOND
    assert load_project(backup_path(path)) == FIRST
    assert _names(tmp_path) == ["p.pumpsketch.json", "p.pumpsketch.json.bak"]


def test_the_next_save_removes_the_temporary_files_of_an_interrupted_one(tmp_path):
    path = tmp_path / "p.pumpsketch.json"
    save_project(FIRST, path)
    stale = [tmp_path / ".p.pumpsketch.json.k2j3h4.tmp", tmp_path / ".p.pumpsketch.json.bak.x8y9z0.tmp"]
    others = [
        tmp_path / ".other.pumpsketch.json.k2j3h4.tmp",  # another project's: not ours to remove
        tmp_path / ".p.pumpsketch.json.notes",  # not a temporary name
        tmp_path / "p.pumpsketch.json.k2j3h4.tmp",  # no leading dot: not made by the writer
        tmp_path / ".p.pumpsketch.json..tmp",  # no random part
    ]
    for file in stale + others:
        file.write_text("{ half a proj", encoding="utf-8")
    save_project(SECOND, path)
    assert not any(file.exists() for file in stale)
    assert all(file.exists() for file in others)
    assert load_project(path) == SECOND


def test_cleaning_up_never_fails_a_save(tmp_path, monkeypatch):
    path = tmp_path / "p.pumpsketch.json"
    (tmp_path / ".p.pumpsketch.json.abc123.tmp").mkdir()  # a folder of that name is left alone
    assert remove_stale_temporaries(path) == []
    save_project(FIRST, path)
    assert load_project(path) == FIRST
