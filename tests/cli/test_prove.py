"""``qseries prove``: exit codes 0 proved, 1 differs, 3 not proved, 2 bad input; JSON; and
the note ``check`` prints when an identity looks provable."""

import json

from typer.testing import CliRunner

from qseries.cli.main import app

runner = CliRunner()
# Jacobi's quartic identity (Whittaker and Watson, §21.3, from memory)
JACOBI = ("theta_3(q)^4", "theta_2(q)^4 + theta_4(q)^4")
# the first Rogers-Ramanujan identity (Andrews, Theory of Partitions, ch. 7)
RR1 = ("sum_{k>=0} q^(k^2)/(q;q)_k", "1/((q;q^5)_inf (q^4;q^5)_inf)")


def run(*args: str):
    return runner.invoke(app, list(args))


def test_proved_exit_0():
    r = run("prove", *JACOBI)
    assert r.exit_code == 0 and r.stdout.startswith("PROVED")
    data = json.loads(run("prove", *JACOBI, "--json").stdout)
    assert data["proved"] is True and data["certificate"]["bound"] == 1


def test_differs_exit_1():
    r = run("prove", "theta_3(q)^4", "theta_2(q)^4 + theta_4(q)^4 + 16 eta(q^4)^8/eta(q^2)^4")
    assert r.exit_code == 1 and r.stdout.startswith("DIFFERS")


def test_not_proved_exit_3_whatever_the_evidence_says():
    # issue 15 item 3: a refused proof "runs the ordinary evidence check to --order, and
    # exits 3 ... whatever that check says"
    r = run("prove", *RR1, "-n", "50")
    assert r.exit_code == 3 and r.stdout.startswith("NOT PROVED") and "AGREES" in r.stdout
    # not provable, and the ordinary check finds a mismatch: still exit 3, the mismatch in
    # the evidence (holds false, first_mismatch)
    r = run("prove", "sum_{n>=1} q^n/(1-q^n)", "q", "-n", "10", "--json")
    assert r.exit_code == 3
    data = json.loads(r.stdout)
    assert data["holds"] is False and data["reason"] and data["certificate"] is None
    assert data["first_mismatch"]["index"] == 2 and data["evidence"]["holds"] is False
    r = run("prove", "sum_{n>=1} q^n/(1-q^n)", "q", "-n", "10")
    assert r.exit_code == 3 and r.stdout.startswith("NOT PROVED") and "DIFFERS" in r.stdout


def test_bad_input_exit_2():
    r = run("prove", "theta_3(q", "1")
    assert r.exit_code == 2 and "error" in r.stderr
    r = run("prove", "theta_3(q", "1", "--json")
    assert r.exit_code == 2 and "position" in json.loads(r.stdout)["error"]


def test_define_is_expanded():
    r = run("prove", "T(q)^4", "theta_2(q)^4 + theta_4(q)^4", "--define",
            "T(q) = sum_{n=-inf}^{inf} q^(n^2)")
    assert r.exit_code == 0


def test_check_mentions_prove_when_provable():
    r = run("check", *JACOBI, "-n", "20")
    assert r.exit_code == 0 and "qseries prove" in r.stdout
    r = run("check", *RR1, "-n", "20")
    assert r.exit_code == 0 and "qseries prove" not in r.stdout
