"""A regular (non-editable) install ships the catalogue: build a wheel from a copy of the
source tree, install it into a fresh virtual environment, and run `list`, `verify` and the
hypothesis strategies from another folder (issue 12, section 3)."""

import os
import shutil
import subprocess
import sys
import zipfile
from pathlib import Path

import pytest

import qseries

ROOT = Path(qseries.__file__).resolve().parent.parent


#: the environment of the subprocesses, without PYTHONPATH: a PYTHONPATH pointing at a checkout
#: (as when the suite runs from a worktree with PYTHONPATH=$PWD) would shadow the installed
#: wheel, and the test would check the checkout instead
ENV = {k: v for k, v in os.environ.items() if k != "PYTHONPATH"}


def _run(args: list, cwd: Path, timeout: float = 120) -> subprocess.CompletedProcess:
    r = subprocess.run([str(a) for a in args], cwd=cwd, capture_output=True, text=True,
                       timeout=timeout, env=ENV)
    assert r.returncode == 0, f"{args}\n{r.stdout}\n{r.stderr}"
    return r


@pytest.mark.skipif(not (ROOT / "pyproject.toml").exists(), reason="needs the source tree")
def test_a_wheel_install_finds_the_shipped_catalogue(tmp_path):
    src = tmp_path / "src"      # build from a copy: nothing is written into the checkout
    ignore = shutil.ignore_patterns("__pycache__", "*.egg-info", "build", "*.pyc")
    src.mkdir()
    for name in ("pyproject.toml", "README.md", "LICENSE"):
        shutil.copy2(ROOT / name, src / name)
    for name in ("qseries", "identities"):
        shutil.copytree(ROOT / name, src / name, ignore=ignore)
    dist = tmp_path / "dist"
    _run([sys.executable, "-m", "pip", "wheel", "--no-deps", "--no-build-isolation",
          "--no-index", "-q", "-w", dist, src], cwd=tmp_path)
    (wheel,) = dist.glob("qseries-*.whl")

    # the wheel holds every module of the package and every file of the catalogue
    names = set(zipfile.ZipFile(wheel).namelist())
    modules = {p.relative_to(ROOT).as_posix() for p in (ROOT / "qseries").rglob("*.py")}
    assert modules <= names, sorted(modules - names)
    shipped = {f"qseries/catalogue/identities/{p.name}"
               for p in (ROOT / "identities").glob("*.toml")}
    assert shipped and shipped <= names, sorted(shipped - names)

    # a fresh environment that sees the installed dependencies but gets qseries from the wheel
    venv = tmp_path / "venv"
    _run([sys.executable, "-m", "venv", "--system-site-packages", "--without-pip", venv],
         cwd=tmp_path)
    python = venv / "bin" / "python"
    _run([python, "-m", "pip", "install", "--no-deps", "--no-index", "--force-reinstall", "-q",
          wheel], cwd=tmp_path)
    elsewhere = tmp_path / "elsewhere"
    elsewhere.mkdir()
    where = _run([python, "-c", "import qseries; print(qseries.__file__)"], cwd=elsewhere)
    assert Path(where.stdout.strip()).is_relative_to(venv), where.stdout

    listed = _run([venv / "bin" / "qseries", "list", "--json"], cwd=elsewhere)
    assert "rogers-ramanujan-1" in listed.stdout
    verified = _run([venv / "bin" / "qseries", "verify", "--only", "rogers-ramanujan-1",
                     "--json"], cwd=elsewhere)
    assert '"ok": true' in verified.stdout
    strategies = _run([python, "-c", STRATEGY_SCRIPT], cwd=elsewhere)
    shipped_at, key = strategies.stdout.split()
    assert Path(shipped_at).is_relative_to(venv) and key == "andrews-gordon"


STRATEGY_SCRIPT = """
from hypothesis import given, settings
from qseries.catalogue import SHIPPED
from qseries.testing.strategies import family_members
seen = []
@settings(max_examples=3, database=None)
@given(family_members("andrews-gordon"))
def draw(entry):
    seen.append(entry.key)
draw()
print(SHIPPED, seen[0])
"""
