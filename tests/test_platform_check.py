"""The check of Qt's X11 libraries before the window opens: parsing, mapping and decisions.

No real installs: ``ldd``, the loader, the user id and apt-get are replaced by fakes.  The ldd
text is the shape GNU ldd prints (taken from ldd on PySide6 6.10's libqxcb.so on Debian 12,
shortened).
"""

import subprocess
from pathlib import Path

import pytest

from app import platform_check as pc

LDD_PLUGIN = """\
\tlinux-vdso.so.1 (0x00007fde73ab5000)
\tlibQt6XcbQpa.so.6 => /venv/PySide6/Qt/plugins/platforms/../../lib/libQt6XcbQpa.so.6 (0x00007fde739e6000)
\tlibGL.so.1 => /lib/x86_64-linux-gnu/libGL.so.1 (0x00007fde73956000)
\tlibxcb-cursor.so.0 => /lib/x86_64-linux-gnu/libxcb-cursor.so.0 (0x00007fde738fc000)
\tlibxcb-icccm.so.4 => not found
\tlibxcb-keysyms.so.1 => not found
\tlibxcb-randr.so.0 => /lib/x86_64-linux-gnu/libxcb-randr.so.0 (0x00007fde72ded000)
\tlibc.so.6 => /lib/x86_64-linux-gnu/libc.so.6 (0x00007fde71c1e000)
\tlibxcb-icccm.so.4 => not found
\t/lib64/ld-linux-x86-64.so.2 (0x00007fde73ab7000)
"""
LDD_QPA = """\
\tlibxcb-icccm.so.4 => not found
\tlibxkbcommon-x11.so.0 => not found
\tlibodd-vendor.so.7 => not found
"""
PLUGIN = Path("/venv/PySide6/Qt/plugins/platforms/libqxcb.so")
QPA = Path("/venv/PySide6/Qt/lib/libQt6XcbQpa.so.6")


def fake_ldd(path):
    return {PLUGIN: LDD_PLUGIN, QPA: LDD_QPA}[path]


def test_ldd_not_found_lines_are_collected_once_in_order():
    assert pc.not_found_in_ldd(LDD_PLUGIN) == ["libxcb-icccm.so.4", "libxcb-keysyms.so.1"]
    assert pc.not_found_in_ldd("\tstatically linked\n") == []
    assert pc.not_found_in_ldd("") == []


def test_missing_libraries_join_both_files_and_the_run_time_cursor_library():
    assert pc.missing_libraries([PLUGIN, QPA], ldd=fake_ldd, can_load=lambda name: False) == [
        "libxcb-icccm.so.4", "libxcb-keysyms.so.1", "libxkbcommon-x11.so.0", "libodd-vendor.so.7",
        "libxcb-cursor.so.0"]
    assert pc.missing_libraries([PLUGIN], ldd=fake_ldd, can_load=lambda name: True) == [
        "libxcb-icccm.so.4", "libxcb-keysyms.so.1"]


def test_the_three_libraries_of_a_minimal_debian_12_map_to_their_packages():
    # the packages a minimal Debian 12 image lacked (libxcb-cursor0, libxcb-icccm4, libxcb-keysyms1)
    packages, unknown = pc.packages_for(["libxcb-cursor.so.0", "libxcb-icccm.so.4", "libxcb-keysyms.so.1"])
    assert packages == ["libxcb-cursor0", "libxcb-icccm4", "libxcb-keysyms1"] and unknown == []


def test_an_unknown_library_is_named_as_it_is():
    assert pc.packages_for(["libodd-vendor.so.7", "libEGL.so.1"]) == (["libegl1"], ["libodd-vendor.so.7"])


@pytest.mark.parametrize("platform, environ, wanted", [
    ("linux", {}, True),
    ("linux", {"QT_QPA_PLATFORM": "xcb"}, True),
    ("linux", {"QT_QPA_PLATFORM": "xcb:no-grab"}, True),
    ("linux", {"QT_QPA_PLATFORM": "offscreen"}, False),
    ("linux", {"QT_QPA_PLATFORM": "wayland"}, False),
    ("linux", {"QT_QPA_PLATFORM": "wayland;xcb"}, True),
    ("win32", {}, False),
    ("darwin", {}, False),
])
def test_the_check_runs_only_where_the_xcb_plugin_is_used(platform, environ, wanted):
    assert pc.check_wanted(platform, environ) is wanted


def test_nothing_missing_means_nothing_to_do():
    assert pc.plan([], is_root=False, has_apt=False) == pc.Plan()


def test_root_with_apt_installs_the_packages():
    step = pc.plan(["libxcb-icccm.so.4", "libxcb-keysyms.so.1"], is_root=True, has_apt=True)
    assert step.install == ("libxcb-icccm4", "libxcb-keysyms1") and step.report == ""


def test_a_user_gets_the_packages_and_the_one_command():
    step = pc.plan(["libxcb-icccm.so.4", "libxcb-keysyms.so.1"], is_root=False, has_apt=True)
    assert step.install == ()
    assert "libxcb-icccm.so.4, libxcb-keysyms.so.1" in step.report
    assert "Missing packages: libxcb-icccm4 libxcb-keysyms1" in step.report
    commands = [line.strip() for line in step.report.splitlines() if "apt-get install" in line]
    assert commands == ["sudo apt-get install libxcb-icccm4 libxcb-keysyms1"]


def test_root_without_apt_gets_the_list_and_no_install():
    step = pc.plan(["libxcb-icccm.so.4"], is_root=True, has_apt=False)
    assert step.install == () and "provide these libraries" in step.report
    assert "apt-get install libxcb-icccm4" in step.report and "sudo" not in step.report


def test_an_unknown_library_alone_is_reported_not_installed():
    step = pc.plan(["libodd-vendor.so.7"], is_root=True, has_apt=True)
    assert step.install == () and step.unknown == ("libodd-vendor.so.7",)
    assert "No package is known for libodd-vendor.so.7" in step.report and "apt-get install" not in step.report


def test_still_missing_after_an_install_is_reported_without_a_second_install():
    step = pc.plan(["libxcb-icccm.so.4"], is_root=True, has_apt=True, after_install=True)
    assert step.install == () and "apt-get did not install them" in step.report


class FakeRun:
    def __init__(self, results):
        self.results, self.calls = list(results), []

    def __call__(self, command, **kwargs):
        self.calls.append(command)
        assert kwargs["env"]["DEBIAN_FRONTEND"] == "noninteractive"
        return subprocess.CompletedProcess(command, self.results.pop(0))


INSTALL = ["apt-get", "install", "-y", "--no-install-recommends", "libxcb-icccm4"]


def test_apt_install_updates_first_when_the_lists_are_empty():
    run = FakeRun([0, 0])
    assert pc.apt_install(["libxcb-icccm4"], run=run, lists_empty=lambda: True)
    assert run.calls == [["apt-get", "update"], INSTALL]


def test_apt_install_updates_and_retries_once_after_a_failure():
    run = FakeRun([100, 0, 0])
    assert pc.apt_install(["libxcb-icccm4"], run=run, lists_empty=lambda: False)
    assert run.calls == [INSTALL, ["apt-get", "update"], INSTALL]
    assert not pc.apt_install(["libxcb-icccm4"], run=FakeRun([100, 0, 100]), lists_empty=lambda: False)


def test_apt_lists_count_as_empty_without_package_files(tmp_path):
    assert pc.apt_lists_empty(tmp_path) and pc.apt_lists_empty(tmp_path / "absent")
    (tmp_path / "deb.debian.org_debian_dists_bookworm_main_binary-amd64_Packages.lz4").write_bytes(b"")
    assert not pc.apt_lists_empty(tmp_path)


# --------------------------------------------------------------------------- the command as a whole
@pytest.fixture
def system(monkeypatch):
    """A Linux system with the xcb plugin, two libraries missing, and fakes for everything else."""
    state = {"missing": ["libxcb-icccm.so.4", "libxcb-keysyms.so.1"], "installed": []}
    monkeypatch.setattr(pc.sys, "platform", "linux")
    monkeypatch.delenv("QT_QPA_PLATFORM", raising=False)
    monkeypatch.setattr(pc, "pyside_dir", lambda: Path("/venv/PySide6"))
    monkeypatch.setattr(pc, "xcb_plugin_files", lambda folder: [PLUGIN, QPA])
    monkeypatch.setattr(pc.shutil, "which", lambda name: f"/usr/bin/{name}")
    monkeypatch.setattr(pc, "missing_libraries", lambda files: list(state["missing"]))

    def install(packages):
        state["installed"] += packages
        state["missing"] = []
        return True

    monkeypatch.setattr(pc, "apt_install", install)
    return state


def test_as_a_user_the_command_reports_and_exits_2(system, monkeypatch, capsys):
    monkeypatch.setattr(pc.os, "geteuid", lambda: 1000)
    assert pc.main([]) == pc.MISSING == 2
    assert "sudo apt-get install libxcb-icccm4 libxcb-keysyms1" in capsys.readouterr().err
    assert system["installed"] == []


def test_as_root_the_command_installs_and_lets_the_window_start(system, monkeypatch, capsys):
    monkeypatch.setattr(pc.os, "geteuid", lambda: 0)
    assert pc.main([]) == 0
    assert system["installed"] == ["libxcb-icccm4", "libxcb-keysyms1"]
    assert "installing" in capsys.readouterr().err


def test_as_root_a_failed_install_exits_2(system, monkeypatch, capsys):
    monkeypatch.setattr(pc.os, "geteuid", lambda: 0)
    monkeypatch.setattr(pc, "apt_install", lambda packages: False)
    assert pc.main([]) == 2
    assert "apt-get did not install them" in capsys.readouterr().err


def test_offscreen_and_other_systems_are_not_checked(system, monkeypatch):
    monkeypatch.setattr(pc.os, "geteuid", lambda: 1000)
    monkeypatch.setenv("QT_QPA_PLATFORM", "offscreen")
    assert pc.main([]) == 0
    monkeypatch.delenv("QT_QPA_PLATFORM")
    monkeypatch.setattr(pc.sys, "platform", "win32")
    assert pc.main([]) == 0


def test_nothing_missing_exits_0_silently(system, monkeypatch, capsys):
    system["missing"] = []
    monkeypatch.setattr(pc.os, "geteuid", lambda: 1000)
    assert pc.main([]) == 0 and capsys.readouterr().err == ""


def test_the_module_imports_no_qt():
    result = subprocess.run(
        [pc.sys.executable, "-c", "import sys, app.platform_check; "
         "print(sorted(m for m in sys.modules if m.startswith(('PySide6', 'shiboken6', 'pyqtgraph'))))"],
        capture_output=True, text=True, timeout=60, cwd=Path(__file__).resolve().parent.parent)
    assert result.returncode == 0, result.stderr
    assert result.stdout.strip() == "[]"


def test_the_real_plugin_files_are_found_in_the_installed_pyside():
    folder = pc.pyside_dir()
    assert folder is not None and (folder / "__init__.py").is_file()
    if pc.sys.platform.startswith("linux"):
        assert [path.name for path in pc.xcb_plugin_files(folder)] == ["libqxcb.so", "libQt6XcbQpa.so.6"]
