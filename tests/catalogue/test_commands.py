"""The `verify` and `list` commands on hostile identity files and on Ctrl-C: exit 2 with
file:line (never a traceback, a hang or a machine out of memory), exit 130 with what finished."""

import json
import os
import resource
import signal
import subprocess
import sys
import time
from pathlib import Path

import pytest
from typer.testing import CliRunner

from qseries.cli.main import app

from .limits import deadline, memory_cap

runner = CliRunner()

ENTRY = '''[[identity]]
key = "KEY"
title = "an entry"
left = "LEFT"
right = "RIGHT"
order = ORDER
source = "invented for this test"
'''


def entry(key: str, left: str = "(-q;q)_inf", right: str = "1/(q;q^2)_inf", order: int = 30,
          extra: str = "") -> str:
    return (ENTRY.replace("KEY", key).replace("LEFT", left).replace("RIGHT", right)
            .replace("ORDER", str(order)) + extra + "\n")


def qseries(*args: str, timeout: float = 60) -> subprocess.CompletedProcess:
    """Run the CLI in a fresh process with at most 2 GiB of address space."""
    def cap():
        resource.setrlimit(resource.RLIMIT_AS, (2 << 30, resource.RLIM_INFINITY))

    return subprocess.run([sys.executable, "-m", "qseries", *args], capture_output=True,
                          text=True, timeout=timeout, preexec_fn=cap)


# `list` and `verify` run in a fresh process in test_packaging.py and in the Ctrl-C tests below;
# the hostile files go through the same commands in-process, under a deadline and a memory cap
# (each fresh process cost half a second of start-up)
@pytest.mark.parametrize("command", ["list", "verify"])
def test_a_huge_family_is_refused_at_once(tmp_path, command):
    path = tmp_path / "huge.toml"
    path.write_text(entry("huge", "1/(1-q^$m)", "1/(1-q^$m)", extra='params = { m = "1..10^18" }'))
    with deadline(30), memory_cap():
        r = runner.invoke(app, [command, str(path)])
    assert r.exit_code == 2, (r.output, r.exception)
    assert f"{path}:8: more than" in r.stderr and "family members" in r.stderr
    assert "Traceback" not in r.output


@pytest.mark.parametrize("command", ["list", "verify"])
def test_a_fifo_in_the_folder_is_refused(tmp_path, command):
    (tmp_path / "good.toml").write_text(entry("good"))
    os.mkfifo(tmp_path / "waiting.toml")
    with deadline(30):                  # opening the FIFO would wait for a writer forever
        r = runner.invoke(app, [command, str(tmp_path)])
    assert r.exit_code == 2, (r.output, r.exception)
    assert f"{tmp_path / 'waiting.toml'}: not a regular file" in r.stderr


def test_a_fresh_process_refuses_a_huge_family_under_a_memory_limit(tmp_path):
    # one end-to-end run: exit code and message of a real process with 2 GiB of address space
    path = tmp_path / "huge.toml"
    path.write_text(entry("huge", "1/(1-q^$m)", "1/(1-q^$m)", extra='params = { m = "1..10^18" }'))
    r = qseries("verify", str(path))
    assert r.returncode == 2, r.stderr
    assert f"{path}:8: more than" in r.stderr and "Traceback" not in r.stderr


@pytest.mark.parametrize("text, line", [
    ("identity = [5]\n", 1),
    (entry("x", extra='expect = "fails"\nfails_at = "inf"'), 9),
    (entry("x", extra='expect = "fails"\nfails_at = 1e400'), 9),
    (entry("x", extra='expect = "fails"\nfails_at = 1979-05-27'), 9),
    (entry("x", extra='expect = "fails"\nfails_at = { a = 1 }'), 9),
])
def test_malformed_fields_exit_2_with_file_and_line(tmp_path, text, line):
    path = tmp_path / "bad.toml"
    path.write_text(text)
    for command in (["verify", "-j", "1"], ["list"]):
        r = runner.invoke(app, [*command, str(path)])
        assert r.exit_code == 2, (r.output, r.exception)
        assert r.stderr.startswith(f"qseries: error: {path}:{line}:"), r.stderr


def test_an_interrupted_verify_prints_what_finished(monkeypatch):
    import qseries.catalogue as catalogue
    from qseries.catalogue import VerifyInterrupted, verify_entry

    def first_then_interrupt(entries, order=None, jobs=None, progress=None):
        raise VerifyInterrupted([verify_entry(entries[0], order)], len(entries))

    monkeypatch.setattr(catalogue, "verify_entries", first_then_interrupt)
    r = runner.invoke(app, ["verify", "--only", "rogers-ramanujan"])
    assert r.exit_code == 130
    assert "rogers-ramanujan-1" in r.stdout and "holds" in r.stdout
    assert "interrupted" in r.stderr and "1 of " in r.stderr
    r = runner.invoke(app, ["verify", "--only", "rogers-ramanujan", "--json"])
    assert r.exit_code == 130
    data = json.loads(r.stdout)
    assert [x["id"] for x in data["results"]] == ["rogers-ramanujan-1"]
    assert data["summary"]["interrupted"] is True and data["summary"]["finished"] == 1
    assert data["summary"]["entries"] > 1


def _children(pid: int) -> list[int]:
    out = []
    for stat in Path("/proc").glob("[0-9]*/stat"):
        try:
            fields = stat.read_text().rsplit(")", 1)[1].split()
        except (OSError, IndexError):
            continue
        if int(fields[1]) == pid:
            out.append(int(stat.parent.name))
    return out


def _alive(pid: int) -> bool:
    try:
        state = Path(f"/proc/{pid}/stat").read_text().rsplit(")", 1)[1].split()[0]
    except (OSError, IndexError):
        return False
    return state != "Z"


@pytest.mark.skipif(not Path("/proc/self/stat").exists(), reason="reads /proc")
@pytest.mark.parametrize("target", ["group", "main"])
def test_ctrl_c_stops_a_parallel_verify(tmp_path, target):
    # one fast entry and seven that take long (minutes together on two workers)
    slow = "".join(entry(f"slow-{i}", "sum_{n>=0} q^n/(q;q)_n", "1/(q;q)_inf", 40_000)
                   for i in range(7))
    path = tmp_path / "slow.toml"
    path.write_text(entry("fast") + slow)
    proc = subprocess.Popen([sys.executable, "-m", "qseries", "verify", str(path), "-j", "2"],
                            stdout=subprocess.PIPE, stderr=subprocess.PIPE, text=True,
                            start_new_session=True)
    workers: list[int] = []
    try:
        give_up = time.monotonic() + 120      # start-up on a loaded machine
        while len(workers) < 2:
            assert proc.poll() is None, proc.communicate()
            assert time.monotonic() < give_up, "the workers never started"
            time.sleep(0.1)
            workers = _children(proc.pid)
        time.sleep(1)
        if target == "group":            # Ctrl-C on a terminal reaches every process
            os.killpg(proc.pid, signal.SIGINT)
        else:
            proc.send_signal(signal.SIGINT)
        out, err = proc.communicate(timeout=60)
    finally:
        if proc.poll() is None:
            os.killpg(proc.pid, signal.SIGKILL)
            proc.communicate()
    assert proc.returncode == 130, (out, err)
    assert "interrupted" in err and "of 8 entries" in err
    assert "Traceback" not in out + err
    give_up = time.monotonic() + 30
    while any(_alive(w) for w in workers) and time.monotonic() < give_up:
        time.sleep(0.1)
    left = [w for w in workers if _alive(w)]
    for w in left:
        os.kill(w, signal.SIGKILL)
    assert not left, "a worker outlived the interrupted run"


# -- issue 17: definitions, sources, family members' parameters, the slowest entries --

def test_a_bad_definition_exits_2_with_file_and_line(tmp_path):
    path = tmp_path / "defs.toml"
    path.write_text('[definitions]\n"G(q)" = "1/(q;q^5)_inf"\n"K(q)" = "L(q)"\n'
                    '"L(q)" = "K(q^2)"\n\n' + entry("x", right="G(q)"))
    for command in (["verify", "-j", "1"], ["list"]):
        r = runner.invoke(app, [*command, str(path)])
        assert r.exit_code == 2, (r.output, r.exception)
        assert r.stderr.startswith(f"qseries: error: {path}:3:"), r.stderr
        assert "cycle: K -> L -> K" in r.stderr


def test_verify_and_list_use_a_files_definitions(tmp_path):
    path = tmp_path / "defs.toml"
    path.write_text('[definitions]\n"P(q)" = "(-q;q)_inf"\n"D(q)" = "1/(q;q^2)_inf"\n\n'
                    + entry("euler-defined", "P(q)", "D(q)")
                    + entry("fam", "P(q^$m)", "D(q^$m)", extra='params = { m = "1..2" }'))
    r = runner.invoke(app, ["verify", str(path), "-j", "1"])
    assert r.exit_code == 0, r.output
    assert "fam m=2" in r.stdout and "3 of 3 entries behave as recorded" in r.stdout
    assert "slowest: " in r.stdout
    r = runner.invoke(app, ["verify", str(path), "--only", "fam m=1", "--json"])
    assert [x["id"] for x in json.loads(r.stdout)["results"]] == ["fam[m=1]"]
    r = runner.invoke(app, ["list", str(path)])
    assert r.exit_code == 0 and "fam m=1..2" in r.stdout


def test_list_sources_prints_every_citation():
    from qseries.catalogue import SHIPPED, load_entries
    r = runner.invoke(app, ["list", "--sources"])
    assert r.exit_code == 0, r.output
    for e in load_entries([SHIPPED]):
        assert e.source in r.stdout, e.key
    assert "andrews-gordon k=2..5 i=1..k\n    G. E. Andrews" in r.stdout
    assert "Somos" in r.stdout and "p. 170" in r.stdout


def test_verify_and_list_report_a_same_as_pair(tmp_path):
    # theta_4(0,q) = theta_3(0,-q) (DLMF 20.2.3, 20.2.4) with products DLMF 20.5.3, 20.5.4
    same = ('same_as = { key = "theta4", substitution = "q -> -q", '
            'source = "DLMF 20.2.3 and 20.2.4" }')
    path = tmp_path / "pair.toml"
    path.write_text(entry("theta4", "sum_{n=-inf}^{inf} (-1)^n q^(n^2)", "(q;q)_inf/(-q;q)_inf")
                    + entry("theta3", "sum_{n=-inf}^{inf} q^(n^2)",
                            "(q^2;q^2)_inf (-q;q^2)_inf^2", extra=same))
    r = runner.invoke(app, ["verify", str(path), "-j", "1", "--json"])
    assert r.exit_code == 0, r.output
    results = json.loads(r.stdout)["results"]
    assert [x["id"] for x in results] == ["theta4", "theta3", "theta3 ~ theta4 (q -> -q)"]
    assert results[2]["pair"] == {"of": "theta3", "same_as": "theta4",
                                  "substitution": "q -> -q", "swap": False, "differs": None}
    r = runner.invoke(app, ["verify", str(path), "-j", "1"])
    assert r.exit_code == 0 and "3 of 3 entries behave as recorded" in r.stdout
    rows = json.loads(runner.invoke(app, ["list", str(path), "--json"]).stdout)["identities"]
    assert rows[1]["same_as"] == {"id": "theta4", "substitution": "q -> -q", "swap": False,
                                  "source": "DLMF 20.2.3 and 20.2.4"}
    r = runner.invoke(app, ["list", str(path), "--sources"])
    assert "    same as theta4 under q -> -q: DLMF 20.2.3 and 20.2.4" in r.stdout
    # without the substitution the pair differs at q^1 (2 against -2): exit 1
    path.write_text(path.read_text().replace('substitution = "q -> -q", ', ""))
    r = runner.invoke(app, ["verify", str(path), "-j", "1", "--json"])
    assert r.exit_code == 1
    pair = json.loads(r.stdout)["results"][2]
    assert pair["ok"] is False and pair["pair"]["differs"] == "left"
    assert pair["first_mismatch"] == {"index": 1, "lhs": "2", "rhs": "-2"}
    # an unknown key: exit 2 with the file and the line of the field
    path.write_text(path.read_text().replace('key = "theta4", ', 'key = "theta5", '))
    for command in (["verify"], ["list"]):
        r = runner.invoke(app, [*command, str(path)])
        assert r.exit_code == 2
        assert r.stderr.startswith(f"qseries: error: {path}:16: same_as names 'theta5'"), \
            r.stderr


def test_list_json_of_the_shipped_catalogue_shows_corrections_and_pairs():
    rows = {row["id"]: row for row in json.loads(runner.invoke(app, ["list", "--json"]).stdout)
            ["identities"]}
    # Somos' correction of Berndt IV, ch. 25, Entry 27 (27.1), recorded beside the misprint
    assert rows["berndt-iv-25-27-1"]["corrects"] == "berndt-iv-25-27-1-printed"
    assert "corrects" not in rows["berndt-iv-25-27-1-printed"]
    # theta_3(q) = theta_4(-q) (DLMF 20.2.3, 20.2.4)
    assert rows["triple-product-theta-3"]["same_as"]["substitution"] == "q -> -q"
    assert "same_as" not in rows["euler-pentagonal"]
