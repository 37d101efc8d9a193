"""The README's command lines, copied into a POSIX shell as they stand."""

from __future__ import annotations

import re
from pathlib import Path

from typer.testing import CliRunner

from qseries.cli.main import app

README = Path(__file__).resolve().parent.parent / "README.md"

#: a "$NAME" or "$(...)" inside double quotes: the shell replaces it before qseries sees it
_EXPANDED = re.compile(r'"[^"]*\$[A-Za-z(][^"]*"')


def _command_lines(text: str) -> list[str]:
    return [line.strip() for line in text.splitlines()
            if line.strip().startswith(("$ qseries", "qseries "))
            or "Example: qseries" in line]


def test_no_readme_command_puts_a_template_parameter_in_double_quotes():
    # `qseries scan "sum ... $b n ..."` pasted into bash scanned "q^(n^2+ n)": the shell had
    # replaced $b by nothing (POSIX shells expand $NAME inside double quotes, not single ones)
    lines = [line for line in _command_lines(README.read_text(encoding="utf-8"))
             if _EXPANDED.search(line)]
    assert lines == []


def test_no_help_example_puts_a_template_parameter_in_double_quotes():
    out = CliRunner().invoke(app, ["scan", "--help"], terminal_width=200).stdout
    lines = [line for line in out.splitlines() if "qseries scan" in line]
    assert lines and not any(_EXPANDED.search(line) for line in lines)
