"""Progress on a terminal (qseries/cli/progress.py): run in a pseudo-terminal, `verify`
prints each entry as it finishes under a bar and `check` shows a bar; on a pipe, under
--json or with --quiet nothing of it; Ctrl-C ends a check with one line and exit 130."""

import os
import re
import select
import signal
import subprocess
import sys
import time
from pathlib import Path

import pytest

import qseries
from qseries.analysis import check
from qseries.cli.progress import stage_step

pty = pytest.importorskip("pty", reason="pseudo-terminals are POSIX only")

ROOT = str(Path(qseries.__file__).resolve().parent.parent)
ANSI = re.compile(r"\x1b\[[0-9;?]*[A-Za-z]")

CATALOGUE = '''[[identity]]
key = "euler"
title = "Euler"
left = "(-q;q)_inf"
right = "1/(q;q^2)_inf"
order = 200
source = "Euler's partition theorem (Andrews, The Theory of Partitions, Cor. 1.2)"

[[identity]]
key = "jacobi"
title = "Jacobi"
left = "(q;q)_inf^3"
right = "sum_{n>=0} (-1)^n (2n+1) q^(n(n+1)/2)"
order = 300
source = "Jacobi (Andrews, The Theory of Partitions, Thm. 2.8)"

[[identity]]
key = "wrong"
title = "a wrong one"
left = "1/(1-q)"
right = "1/(1-q) + q^7"
order = 30
source = "invented for this test"
'''


def run(args, terminal=True, interrupt_after=None, give_up=180):
    """(exit code, everything written) of ``qseries ARGS`` with stdout and stderr on a
    pseudo-terminal (or on pipes)."""
    env = {**os.environ, "TERM": "xterm", "COLUMNS": "120",
           "PYTHONPATH": ROOT + os.pathsep + os.environ.get("PYTHONPATH", "")}
    cmd = [sys.executable, "-m", "qseries", *args]
    if not terminal:
        p = subprocess.run(cmd, capture_output=True, text=True, env=env, timeout=give_up)
        return p.returncode, ANSI.sub("", p.stdout + p.stderr)
    master, slave = pty.openpty()
    proc = subprocess.Popen(cmd, stdin=slave, stdout=slave, stderr=slave, env=env,
                            close_fds=True, start_new_session=True)
    os.close(slave)
    chunks, t0, sent = [], time.monotonic(), False
    try:
        while True:
            assert time.monotonic() - t0 < give_up, "the command hung"
            if interrupt_after is not None and not sent and \
                    time.monotonic() - t0 > interrupt_after:
                os.killpg(proc.pid, signal.SIGINT)      # Ctrl-C reaches the whole group
                sent = True
            ready, _, _ = select.select([master], [], [], 0.2)
            if ready:
                try:
                    data = os.read(master, 65536)
                except OSError:                    # EIO: the terminal's other end closed
                    break
                if not data:
                    break
                chunks.append(data)
            elif proc.poll() is not None:
                break
        code = proc.wait(timeout=60)
    finally:
        if proc.poll() is None:
            os.killpg(proc.pid, signal.SIGKILL)
        os.close(master)
    return code, ANSI.sub("", b"".join(chunks).decode(errors="replace"))


@pytest.fixture
def catalogue(tmp_path):
    path = tmp_path / "three.toml"
    path.write_text(CATALOGUE)
    return str(path)


def test_verify_streams_each_entry_on_a_terminal(catalogue):
    code, out = run(["verify", catalogue, "-j", "1"])
    assert code == 1                           # "wrong" fails and is not recorded as failing
    assert "verifying" in out and "0/3" in out and "3/3" in out        # the bar
    for line in ("euler  holds  order 200", "jacobi  holds  order 300",
                 "wrong  FAILS  order 30"):
        assert line in out
    assert "q^7: 1 vs 2" in out and "2 of 3 entries behave as recorded" in out
    assert "identifier" not in out             # the lines came one by one, no table at the end


@pytest.mark.parametrize("how", ["pipe", "quiet", "json"])
def test_no_progress_on_a_pipe_with_quiet_or_json(catalogue, how):
    args = ["verify", catalogue, "-j", "1"] + (["--quiet"] if how == "quiet" else
                                               ["--json"] if how == "json" else [])
    code, out = run(args, terminal=how != "pipe")
    assert code == 1 and "verifying" not in out
    if how == "quiet":
        assert "identifier" in out             # the table, once, at the end
    elif how == "pipe":                        # into a pipe: one whole line per entry
        assert "identifier" not in out and "wrong  FAILS  order 30" in out.splitlines()[2]


def test_check_shows_a_bar_per_prime_on_a_terminal():
    args = ["check", "(q;q)_inf^3", "sum_{n>=0} (-1)^n (2n+1) q^(n(n+1)/2)", "-n", "5000",
            "--method", "modular"]
    code, out = run(args)
    assert code == 0 and "checking" in out and "AGREES" in out
    code, out = run(args + ["--quiet"])
    assert code == 0 and "checking" not in out and "comparing modulo" not in out
    code, out = run(args, terminal=False)
    assert code == 0 and "checking" not in out and "comparing modulo" not in out


def test_ctrl_c_ends_a_check_with_one_line_and_exit_130():
    code, out = run(["check", "1/(q;q)_inf", "sum_{n>=0} q^n/(q;q)_n", "-n", "300000",
                     "--allow-long"], interrupt_after=3)
    assert code == 130
    assert "qseries: interrupted" in out and "Traceback" not in out


def test_the_stages_check_reports_are_steps_of_the_bar():
    said = []
    check("1/(1-q)", "1/(1-q)", order=50, method="modular", primes=3, progress=said.append)
    steps = [stage_step(t) for t in said]
    assert steps[0] == (0, 3) and (2, 3) in steps
    said.clear()
    check("1/(1-q)", "1/(1-q)", order=50, method="exact", progress=said.append)
    assert [stage_step(t) for t in said] == [(0, 2), (1, 2)]


def test_primes_in_worker_processes_are_steps_too():
    # from order 50000 (chooser.PARALLEL_ORDER) the other primes run in worker processes;
    # each is reported as it is waited for; the first prime, in this process, also per
    # side (one part each). Euler's pentagonal number theorem.
    said = []
    r = check("(q;q)_inf", "sum_{n=-inf}^{inf} (-1)^n q^(n(3n-1)/2)", order=50_000,
              method="modular", primes=3, progress=said.append)
    assert r.holds
    assert [stage_step(t) for t in said] == [(0, 3), (0.5, 3), (1, 3), (1, 3), (2, 3)]


@pytest.mark.parametrize("args", [
    ["expand", "1/(q;q)_inf", "-n", "3000"],
    ["product", "sum_{k>=0} q^(k^2)/(q;q)_k", "-n", "2000"],
    ["distribution", "sum_{k>=0} z^k q^(k^2)/(q;q)_k^2", "--trend-upto", "2000", "--out",
     "{tmp}/t.csv"],
])
def test_long_evaluations_show_a_moving_bar(tmp_path, args):
    args = [a.replace("{tmp}", str(tmp_path)) for a in args]
    code, out = run(args)
    assert code == 0 and "evaluating to O(q^" in out
    code, out = run(args + ["--quiet"])
    assert code == 0 and "evaluating to" not in out
    code, out = run(args, terminal=False)
    assert code == 0 and "evaluating to" not in out


def test_the_parts_of_each_side_are_steps_of_the_bar():
    # Rogers-Ramanujan (Andrews, The Theory of Partitions, Cor. 7.9), modular, 2 primes:
    # the steps never go back, and each side's parts fill its share of a prime
    said = []
    check("sum_{k>=0} q^(k^2)/(q;q)_k", "1/((q;q^5)_inf (q^4;q^5)_inf)", order=200,
          method="modular", primes=2, progress=said.append)
    steps = [s for s in map(stage_step, said) if s is not None]
    assert steps == [(0, 2), (0.5, 2), (0.75, 2), (1, 2), (1, 2), (1.5, 2), (1.75, 2), (2, 2)]
    said.clear()
    check("sum_{k>=0} q^(k^2)/(q;q)_k", "1/((q;q^5)_inf (q^4;q^5)_inf)", order=200,
          method="exact", progress=said.append)
    assert [stage_step(t) for t in said] == [(0, 2), (1, 2), (1, 2), (1.5, 2), (2, 2)]


PARTS = ["check", "sum_{k>=0} q^(k^2)/(q;q)_k", "1/((q;q^5)_inf (q^4;q^5)_inf)", "-n", "4000",
         "--method", "exact"]


def test_check_names_each_evaluated_part_on_a_terminal_only():
    code, out = run(PARTS)
    assert code == 0 and "right side: evaluated part 2 of 2, (q^4;q^5)_inf" in out
    for how in (["--quiet"], ["--json"]):
        code, out = run(PARTS + how)
        assert code == 0 and "evaluated part" not in out
    code, out = run(PARTS, terminal=False)
    assert code == 0 and "evaluated part" not in out and "AGREES" in out


TREND = ["distribution", "sum_{k>=0} z^k q^(k^2)/(q;q)_k^2", "--trend-upto", "2500"]


def test_distribution_trend_advances_per_n_on_a_terminal_only(tmp_path):
    out_file = str(tmp_path / "t.csv")
    code, out = run(TREND + ["--out", out_file])
    assert code == 0 and "reading the distribution at n = 2500 (2500 of 2500)" in out
    code, out = run(TREND + ["--out", out_file, "--quiet"])
    assert code == 0 and "reading the distribution" not in out
    code, out = run(TREND + ["--format", "json", "--out", out_file, "--json"])
    assert code == 0 and "reading the distribution" not in out
    code, out = run(TREND, terminal=False)
    assert code == 0 and "reading the distribution" not in out and out.startswith("n,total")
