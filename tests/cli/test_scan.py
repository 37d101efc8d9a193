"""qseries scan: output, JSON, the identity file that verify reads as it is, resuming,
Ctrl-C, a Dask scheduler address, and bad input (exit 2)."""

import json
import os
import signal
import subprocess
import sys
import time
import tomllib

import pytest
from typer.testing import CliRunner

from qseries.analysis import check
from qseries.cli.main import app
from qseries.discovery import progress_path

runner = CliRunner()
# Rogers-Ramanujan (L. J. Rogers 1894; G. E. Andrews, The Theory of Partitions, 1976,
# Cor. 7.6 and 7.7, numbering from memory)
RR = "sum_{n>=0} q^(n^2+$b n)/(q;q)_n"
RR_PRODUCTS = {0: "1/((q;q^5)_inf (q^4;q^5)_inf)", 1: "1/((q^2;q^5)_inf (q^3;q^5)_inf)"}


def run(*args):
    return runner.invoke(app, ["scan", *args])


def test_text_output_and_exit_codes():
    r = run(RR, "-p", "b=0..3", "-n", "200", "-j", "1")
    assert r.exit_code == 0, r.output
    assert "confirmed at order 200 2 (2 groups)" in r.stdout
    assert "b=0: sum_{n>=0} q^(n^2+0 n)/(q;q)_n = (q, q^4;q^5)_inf^-1" in r.stdout
    r = run(RR, "-p", "b=2..3", "-n", "200", "-j", "1")
    assert r.exit_code == 1 and "no hits" in r.stdout


def test_json_output_has_the_issue_shape():
    r = run(RR, "-p", "b=0..3", "--where", "b != 2", "-n", "200", "-j", "1", "--json")
    assert r.exit_code == 0, r.output
    data = json.loads(r.stdout)
    assert data["order"] == 200 and data["members"] == 3
    hits = {h["params"]["b"]: h for h in data["hits"]}
    assert set(hits) == {0, 1}
    for b, h in hits.items():
        assert check(h["product"], RR_PRODUCTS[b], order=200).holds is True
        assert h["expression"] == f"sum_{{n>=0}} q^(n^2+{b} n)/(q;q)_n"
    assert data["failed"] == []


def test_the_out_file_is_an_identity_file_verify_accepts(tmp_path):
    out = tmp_path / "rr.toml"
    r = run(RR, "-p", "b=0..3", "-n", "200", "-j", "1", "-o", str(out))
    assert r.exit_code == 0, r.output
    data = tomllib.loads(out.read_text())
    sources = {e["source"] for e in data["identity"]}
    assert len(sources) == 1 and sources.pop().startswith("found by scan on ")
    assert all(e["left"] == RR and e["order"] == 200 for e in data["identity"])
    assert "template: " + RR in out.read_text()
    v = runner.invoke(app, ["verify", str(out), "-n", "600", "-j", "1", "--json"])
    assert v.exit_code == 0, v.output
    results = json.loads(v.stdout)["results"]
    assert [(x["id"], x["holds"], x["order"]) for x in results] == [
        ("rr-1[b=0]", True, 600), ("rr-2[b=1]", True, 600)]


def test_resume_reads_the_record_and_computes_only_the_rest(tmp_path):
    out = tmp_path / "hits.toml"
    args = [RR, "-p", "b=-2..5", "-n", "150", "-j", "1", "-o", str(out), "--json"]
    first = run(*args)
    assert first.exit_code == 0 and json.loads(first.stdout)["computed"] == 8
    whole = out.read_text()
    # as if interrupted after three members: keep the header and three records
    record = progress_path(out)
    record.write_text("".join(record.read_text().splitlines(keepends=True)[:4]))
    out.unlink()
    again = run(*args, "--resume")
    assert again.exit_code == 0, again.output
    data = json.loads(again.stdout)
    assert (data["resumed"], data["computed"]) == (3, 5)
    assert out.read_text() == whole
    # the same --out without --resume is refused; so is --resume with other options
    refused = run(*args)
    assert refused.exit_code == 2 and "--resume" in refused.stdout
    other = run(RR, "-p", "b=-2..6", "-n", "150", "-o", str(out), "--resume")
    assert other.exit_code == 2 and "different scan" in other.stderr


@pytest.mark.parametrize("args, message", [
    (["-p", "b"], "NAME=LO..HI"),
    (["-p", "b=0..1", "--where", "b <"], "constraint"),
    (["-p", "b=0..10^9", "-p", "c=0..10^9"], "more than"),
    (["-p", "b=0..1", "--resume"], "give --out"),
    (["-p", "c=0..1", "--define", "G(q = 1"], "column"),
    (["-p", "b=0..1", "-j", "2", "--cluster", "tcp://127.0.0.1:9"], "--jobs"),
])
def test_bad_input_exits_2(args, message):
    r = run(RR, *args)
    assert r.exit_code == 2, r.output
    assert message in r.stderr and "Traceback" not in r.output


def test_members_that_fail_are_listed_not_fatal():
    r = run("sum_{n>=0} q^($a n)", "-p", "a=0..1", "-n", "50", "-j", "1")
    assert r.exit_code == 1
    assert "failed:\n  a=0: sum_{n>=0} q^(0 n): " in r.stdout


def test_a_dask_scheduler_address(tmp_path):
    distributed = pytest.importorskip("distributed")
    with distributed.LocalCluster(n_workers=2, threads_per_worker=1, processes=False,
                                  dashboard_address=":0", silence_logs=50) as cluster:
        r = run(RR, "-p", "b=0..3", "-n", "200", "--cluster", cluster.scheduler_address,
                "--json")
        import dask.config
        with dask.config.set({"scheduler-address": cluster.scheduler_address}):
            configured = run(RR, "-p", "b=0..3", "-n", "200", "--cluster", "config",
                             "--json")
    local = run(RR, "-p", "b=0..3", "-n", "200", "-j", "1", "--json")
    assert r.exit_code == 0, r.output
    assert json.loads(r.stdout)["hits"] == json.loads(local.stdout)["hits"]
    assert configured.exit_code == 0, configured.output
    assert json.loads(configured.stdout)["hits"] == json.loads(local.stdout)["hits"]


def test_an_unreachable_cluster_exits_2():
    pytest.importorskip("distributed")
    r = run(RR, "-p", "b=0..1", "--cluster", "tcp://127.0.0.1:9", "--connect-timeout", "1")
    assert r.exit_code == 2 and "cannot reach the Dask scheduler" in r.stderr


@pytest.mark.parametrize("address", ["nonsense", "foo://x:8786"])
def test_a_malformed_cluster_address_exits_2(address):
    # found by a trial: a traceback from dask and exit 1
    pytest.importorskip("distributed")
    r = run(RR, "-p", "b=0..1", "--cluster", address, "--connect-timeout", "1")
    assert r.exit_code == 2, r.output
    assert "not a Dask scheduler address" in r.stderr and "Traceback" not in r.output


def test_ctrl_c_then_resume(tmp_path):
    # a family slow enough to interrupt: every member passes the filter and is confirmed
    # at order 10000 (in two worker processes)
    out = tmp_path / "slow.toml"
    args = [sys.executable, "-m", "qseries", "scan", "q^$s sum_{n>=0} q^(n^2)/(q;q)_n",
            "-p", "s=0..19", "-n", "10000", "-j", "2", "--batch", "1", "-o", str(out)]
    proc = subprocess.Popen(args, stdout=subprocess.PIPE, stderr=subprocess.PIPE, text=True,
                            start_new_session=True)
    record = progress_path(out)
    try:
        give_up = time.monotonic() + 120
        while not (record.exists() and record.read_text().count("\n") >= 3):
            assert proc.poll() is None, proc.communicate()
            assert time.monotonic() < give_up, "no member finished"
            time.sleep(0.05)
        os.killpg(proc.pid, signal.SIGINT)
        stdout, stderr = proc.communicate(timeout=60)
    finally:
        if proc.poll() is None:
            os.killpg(proc.pid, signal.SIGKILL)
            proc.communicate()
    assert proc.returncode == 130, (stdout, stderr)
    assert "interrupted" in stderr and "--resume" in stderr and "Traceback" not in stderr
    done = record.read_text().count("\n") - 1
    assert 2 <= done < 20
    # the hits found before the interrupt are in the identity file already
    partial = tomllib.loads(out.read_text())
    assert all(e["source"].startswith("found by scan") for e in partial.get("identity", []))
    assert f"interrupted: {done} of 20 members finished" in out.read_text()
    r = runner.invoke(app, ["scan", *args[4:], "--resume", "--json"])
    assert r.exit_code == 0, r.output
    data = json.loads(r.stdout)
    assert (data["resumed"], data["computed"]) == (done, 20 - done)
    [hit] = data["hits"]            # the first Rogers-Ramanujan identity, and 19 q-shifts
    assert hit["params"] == {"s": 0} and len(hit["related"]) == 19


def test_definitions_reach_the_members_and_the_out_file(tmp_path):
    # G(q) = sum q^(n^2)/(q;q)_n, the first Rogers-Ramanujan function (Andrews 1976,
    # Cor. 7.6, from memory); G(q^k) = 1/((q^k;q^(5k))_inf (q^(4k);q^(5k))_inf)
    out = tmp_path / "g.toml"
    r = run("G(q^$k)", "-p", "k=1..2", "-D", "G(q) = sum_{n>=0} q^(n^2)/(q;q)_n",
            "-n", "200", "-j", "1", "-o", str(out), "--json")
    assert r.exit_code == 0, r.output
    products = {h["params"]["k"]: h["product"] for h in json.loads(r.stdout)["hits"]}
    assert check(products[2], "1/((q^2;q^10)_inf (q^8;q^10)_inf)", order=200).holds is True
    assert '"G(q)" = "sum_{n>=0} q^(n^2)/(q;q)_n"' in out.read_text()
    v = runner.invoke(app, ["verify", str(out), "-n", "400", "-j", "1"])
    assert v.exit_code == 0, v.output


@pytest.mark.parametrize(("template", "spec", "extra", "said"), [
    ("sum_{n>=0} q^(n^2+$c n)/(q;q)_n", "b=0..3", [], "unknown template parameter $c"),
    ("sum_{n>=0} q^(n^2+$b n)/(q;q_n", "b=0..3", [], "expected ')'"),
    ("sum_{n>=0} q^(n^2+$b n)/(q;q)_n", "b=3..0", [], "no member"),
    ("sum_{n>=0} q^(n^2+$b n)/(q;q)_n", "b=0..3", ["--where", "b =< 2"], "write two"),
])
def test_a_template_that_does_not_read_is_bad_input(template, spec, extra, said):
    # found by a trial: these scanned every member, failed each, and exited 1 ("no hits")
    r = run(template, "-p", spec, "-n", "30", *extra)
    assert r.exit_code == 2 and said in r.stderr


@pytest.mark.parametrize(("template", "right", "at"), [
    ("sum_{n>=0} q^(n^2+$b n)/(q;q_n", None, "_n"),
    ("sum_{n>=0} q^(n^2+$b n))/(q;q)_n", None, ")/("),
    ("sum_{n>=0} q^(n^2+$b n)/(q;q)_n", "1/((q^$(b+1);q^5)_inf (q^$(4-b);q^5)_inf", "$"),
])
def test_a_syntax_error_is_placed_in_the_template_as_typed(template, right, at):
    # found by a trial: the column counted in the first member (b=0 put in), which is not
    # the text typed
    extra = ["--right", right] if right else []
    r = run(template, "-p", "b=0..3", *extra, "--json")
    assert r.exit_code == 2, r.output
    error = json.loads(r.stdout)["error"]
    typed = right or template
    position = len(typed) if at == "$" else typed.index(at)
    assert (error["text"], error["position"]) == (typed, position)
    r = run(template, "-p", "b=0..3", *extra)
    assert f"at column {position + 1}\n  {typed}\n" in r.stderr


@pytest.mark.parametrize(("template", "spec", "code", "failed"), [
    # $(6/b) divides by zero at b = 0 only; b = 6 is the first Rogers-Ramanujan identity
    ("sum_{n>=0} q^(n^2+$(6/b) n)/(q;q)_n", "b=0..6", 0, {0, 4, 5}),
    # the member b = 0 ends in "q^"; b = 1 reads
    ("1/(q;q)_inf + q^$repeat(j=1..b;2;)", "b=0..1", 1, {0}),
    # (q;q)_-1 does not read; (q;q)_0 and (q;q)_1 do
    ("sum_{n>=0} q^n/(q;q)_$b", "b=-1..1", 1, {-1}),
])
def test_a_first_member_that_fails_is_listed_when_others_read(template, spec, code, failed):
    # found by a trial: the scan was refused (exit 2) when its first member did not expand
    # or parse, although other members did
    r = run(template, "-p", spec, "-n", "100", "-j", "1", "--json")
    assert r.exit_code == code, r.output
    data = json.loads(r.stdout)
    assert {f["params"]["b"] for f in data["failed"]} == failed


def test_the_out_file_of_a_scan_without_hits_is_read_by_verify(tmp_path):
    # found by a trial: verify said "no entry matches " (an empty list of names)
    out = tmp_path / "none.toml"
    r = run(RR, "-p", "b=2..3", "-n", "100", "-j", "1", "-o", str(out))
    assert r.exit_code == 1 and "0 hits" in out.read_text()
    assert tomllib.loads(out.read_text()) == {}
    v = runner.invoke(app, ["verify", str(out)])
    assert v.exit_code == 2 and f"no identities in {out}" in v.stderr


def test_a_scan_stopped_by_its_engine_keeps_what_finished(tmp_path, monkeypatch):
    # the scheduler of a --cluster scan goes away (tests/discovery/test_engines.py): the
    # hits so far are written, the command says how to resume, exit 2 without a traceback
    import qseries.discovery as discovery
    real = discovery.run_scan

    def stopped(family, criteria, **kwargs):
        report = real(family, criteria, **kwargs)
        done = report.outcomes[:2]
        cut = type(report)(family, criteria, report.members, done,
                           tuple(discovery.group_hits([o for o in done if o.status == "hit"])))
        raise discovery.ScanStopped("lost the Dask cluster (a test)", cut)

    monkeypatch.setattr(discovery, "run_scan", stopped)
    out = tmp_path / "rr.toml"
    r = run(RR, "-p", "b=0..3", "-n", "100", "-j", "1", "-o", str(out))
    assert r.exit_code == 2, r.output
    assert "lost the Dask cluster (a test): 2 of 4 members finished" in r.stderr
    assert f"--resume --out {out}" in r.stderr and "Traceback" not in r.output
    assert [e["params"] for e in tomllib.loads(out.read_text())["identity"]] == [
        {"b": "0..0"}, {"b": "1..1"}]
    j = run(RR, "-p", "b=0..3", "-n", "100", "-j", "1", "--json")
    assert j.exit_code == 2
    data = json.loads(j.stdout)
    assert data["interrupted"] is True
    assert data["error"]["message"].startswith("lost the Dask cluster")
    assert len(data["hits"]) == 2

