"""The command-line contract: outputs, JSON shapes and exit codes (0 agree, 1 mismatch, 2 bad
input, never a traceback)."""

import json
import subprocess
import sys

import pytest
from typer.testing import CliRunner

from qseries.cli.main import app
from qseries.products import FUNCTIONS

runner = CliRunner()

RR1 = ("sum_{k>=0} q^(k^2)/(q;q)_k", "1/((q;q^5)_inf (q^4;q^5)_inf)")


def run(*args: str):
    return runner.invoke(app, list(args))


def test_expand_human_output():
    # the partition numbers p(0) .. p(7), from FLINT's partitions_p
    from qseries.backend import partitions_p
    r = run("expand", "1/(q;q)_inf", "--order", "8")
    assert r.exit_code == 0
    assert [partitions_p(n) for n in range(8)] == [1, 1, 2, 3, 5, 7, 11, 15]
    assert r.stdout.strip() == "1 + q + 2q^2 + 3q^3 + 5q^4 + 7q^5 + 11q^6 + 15q^7 + O(q^8)"


def test_expand_json():
    # Euler's pentagonal number theorem: (q;q)_inf = sum (-1)^k q^(k(3k-1)/2), k = 0, 1, -1, 2,
    # -2 giving q^0, q^1, q^2, q^5, q^7 below q^8; eta(q) = q^(1/24) (q;q)_inf by definition;
    # 1/(2-q) = sum q^k/2^(k+1)
    r = run("expand", "(q;q)_inf", "-n", "8", "--json")
    data = json.loads(r.stdout)
    assert data == {"order": 8, "terms": [[0, "1"], [1, "-1"], [2, "-1"], [5, "1"], [7, "1"]]}
    # the shape in detail: tests/report/test_json_shapes.py


def test_check_agrees_exit_0():
    r = run("check", *RR1, "--order", "300")
    assert r.exit_code == 0
    assert "agree to O(q^300)" in r.stdout and "not a proof" in r.stdout


def test_check_mismatch_exit_1_with_location():
    r = run("check", RR1[0], RR1[1] + " + 5q^40", "--order", "100")
    assert r.exit_code == 1
    assert "first at q^40" in r.stdout
    assert "difference" in r.stdout


def test_check_json_shape():
    r = run("check", RR1[0], RR1[1] + " - q^150", "--order", "151", "--json")
    assert r.exit_code == 1
    data = json.loads(r.stdout)
    assert set(data) == {"holds", "reason", "order", "order_requested", "shortfall",
                         "first_mismatch", "seconds", "hints", "method", "primes", "variables",
                         "weights"}
    assert data["reason"] is None and data["shortfall"] is None
    assert data["method"] == "exact" and data["primes"] == []
    assert data["holds"] is False and data["order"] == 151
    fm = data["first_mismatch"]
    assert fm["index"] == 150 and int(fm["lhs"]) - int(fm["rhs"]) == 1
    r = run("check", RR1[0], RR1[1] + " - q^150", "--order", "150", "--json")
    assert r.exit_code == 0
    assert json.loads(r.stdout)["first_mismatch"] is None


def test_check_reports_the_order_really_verified():
    r = run("check", "q^-3 (1/(1-q) + O(q^10))", "q^-3/(1-q)", "-n", "20", "--json")
    assert json.loads(r.stdout)["order"] == 7


@pytest.mark.parametrize("method", ["exact", "modular"])
def test_check_that_compares_nothing_is_inconclusive_exit_3(method):
    r = run("check", "O(q^-5) + 1", "2", "-m", method)
    assert r.exit_code == 3, r.output
    assert r.stdout.startswith("INCONCLUSIVE") and "AGREES" not in r.stdout
    assert "no coefficient could be compared" in r.stdout and "O(q^" in r.stdout
    r = run("check", "O(q^-5) + 1", "2", "-m", method, "--json")
    assert r.exit_code == 3
    data = json.loads(r.stdout)
    assert data["holds"] is None and data["order"] == -5 and data["first_mismatch"] is None
    assert "no coefficient could be compared" in data["reason"]


@pytest.mark.parametrize("method", ["exact", "modular"])
def test_check_says_when_a_side_carries_its_own_order(method):
    lhs, rhs = "1/(1-q) + O(q^10)", "1/(1-q)"
    r = run("check", lhs, rhs, "-n", "20", "-m", method)
    assert r.exit_code == 0
    assert "fewer than the q^20 asked" in r.stdout and "O(q^10)" in r.stdout
    data = json.loads(run("check", lhs, rhs, "-n", "20", "-m", method, "--json").stdout)
    assert data["holds"] is True and data["reason"] is None
    assert data["order"] == 10 and data["order_requested"] == 20
    assert "the left side is known only below q^10" in data["shortfall"]
    r = run("check", lhs, rhs + " + q^5", "-n", "20", "-m", method)
    assert r.exit_code == 1 and "the left side is known only below q^10" in r.stdout


def test_check_help_describes_every_exit_code():
    text = " ".join(run("check", "--help").stdout.split())
    assert "exit 0 if they agree, 1 at a mismatch, 3 if no coefficient could be compared" \
        in text
    assert "2 for bad input" in text


@pytest.mark.parametrize("args", [
    ["check", "1/(q", "q"],
    ["check", "q", "__import__('os').system('true')"],
    ["check", "sum_{k>=0} 1/(q;q)_k", "1"],
    ["expand", "1/0"],
    ["expand", "infty"],              # near a known name: refused, not i*n*f*t*y
    ["expand", "q^z"],
    ["expand", "1/(1-z)"],
    ["product", "1/(z q;q)_inf"],
    ["expand", "q", "--order", "0"],
    ["expand", "q", "--order", "-5"],
    ["expand", "q", "--order", "abc"],
    ["expand", "(" * 500 + "q" + ")" * 500],
    ["expand", "2^(10^9)"],
    ["expand", "q^(-10^8) (q;q)_inf"],
    ["check", "q", "q", "-m", "modular", "--primes", "21"],
])
def test_bad_input_exits_2_without_traceback(args):
    r = run(*args)
    assert r.exit_code == 2, r.output
    assert "Traceback" not in r.output


def test_parse_error_shows_the_caret():
    r = run("expand", "1 + (q;q)_")
    assert r.exit_code == 2
    assert "column 11" in r.stderr and "^" in r.stderr


def test_notation_lists_every_registered_function():
    r = run("notation")
    assert r.exit_code == 0
    for name in FUNCTIONS:
        assert f"{name}(" in r.stdout


def test_demo_shows_a_success_and_a_located_failure():
    r = run("demo")
    assert r.exit_code == 0
    assert "AGREES" in r.stdout and "DIFFERS" in r.stdout and "first at q^20" in r.stdout


def test_module_entry_point_and_real_process_exit_codes():
    ok = subprocess.run([sys.executable, "-m", "qseries", "check", "q", "q", "-n", "5"],
                        capture_output=True, text=True)
    assert ok.returncode == 0
    bad = subprocess.run([sys.executable, "-m", "qseries", "expand", "q +"],
                         capture_output=True, text=True)
    assert bad.returncode == 2 and "Traceback" not in bad.stderr and "column" in bad.stderr
    unknown = subprocess.run([sys.executable, "-m", "qseries", "check", "O(q^-1)", "1"],
                             capture_output=True, text=True)
    assert unknown.returncode == 3 and "INCONCLUSIVE" in unknown.stdout


@pytest.mark.parametrize("args", [
    ["product", "-1/(q;q)_inf", "-n", "20"],
    ["check", "-q/(1-q)", "q/(q-1)"],
    ["expand", "-n", "5", "-(q;q)_inf", "--json"],
])
def test_an_expression_starting_with_a_minus_sign_is_told_to_follow_the_double_dash(args):
    # "Error: No such option: -1", with nothing about the documented cure
    r = subprocess.run([sys.executable, "-m", "qseries", *args], capture_output=True, text=True)
    assert r.returncode == 2 and "Traceback" not in r.stderr
    message = json.loads(r.stdout)["error"]["message"] if "--json" in args else r.stderr
    assert f"'{args[1] if args[0] != 'expand' else args[3]}'" in message
    assert "--" in message and "minus sign" in message
    # as documented, after -- it reads (qseries expand -n 10 -- "-q/(1-q)")
    ok = subprocess.run([sys.executable, "-m", "qseries", "expand", "-n", "3", "--", "-q"],
                        capture_output=True, text=True)
    assert ok.returncode == 0 and ok.stdout.startswith("-q")


def test_verify_shipped_catalogue_subset_and_json():
    # the command line's path through verify (selection by tag, --order, JSON); every entry is
    # verified at its recorded order in-process by tests/catalogue/test_verify.py, so this
    # end-to-end run stays at a low order (at the recorded orders it took 10 s)
    r = run("verify", "--only", "rogers-ramanujan", "--order", "10", "--json", "-j", "1")
    assert r.exit_code == 0, r.output
    data = json.loads(r.stdout)
    ids = [x["id"] for x in data["results"]]
    assert "rogers-ramanujan-1" in ids and "andrews-gordon[k=3,i=2]" in ids
    first = data["results"][0]
    assert set(first) == {"id", "holds", "ok", "order", "first_mismatch", "seconds"}
    assert {x["order"] for x in data["results"]} == {10}
    assert data["summary"]["ok"] == data["summary"]["entries"] == len(ids)


def test_verify_catches_an_altered_copy(tmp_path):
    from qseries.catalogue import SHIPPED
    text = (SHIPPED / "rogers_ramanujan.toml").read_text()
    altered = text.replace('right = "1/((q;q^5)_inf (q^4;q^5)_inf)"',
                           'right = "1/((q;q^5)_inf (q^4;q^6)_inf)"')
    assert altered != text
    (tmp_path / "copy.toml").write_text(altered)
    r = run("verify", str(tmp_path), "--only", "rogers-ramanujan-1", "-j", "1")
    assert r.exit_code == 1
    assert "FAILS" in r.stdout and "q^9" in r.stdout


def test_verify_and_list_into_a_pipe_print_whole_lines():
    # a table folded to 80 columns broke identifiers ("durfee-rectangle" / "m=1") on a pipe
    r = run("verify", "--only", "durfee-rectangle", "--order", "20", "-j", "1")
    assert r.exit_code == 0, r.output
    lines = r.stdout.splitlines()
    for m in range(1, 6):
        assert any(line.startswith(f"durfee-rectangle m={m}  holds  order 20") for line in lines)
    listing = run("list")
    assert listing.exit_code == 0
    assert any(line.startswith("durfee-rectangle m=1..5  5  ")
               for line in listing.stdout.splitlines())
    assert "┃" not in listing.stdout and "│" not in r.stdout


def test_verify_summary_and_slowest_lines_into_a_pipe_are_whole_lines():
    # the lines under the entries were still folded at 80 columns on a pipe
    # ("... is evidence, not" / "a proof"), so grep saw half of them
    r = run("verify", "--only", "durfee-rectangle", "--order", "20", "-j", "1")
    assert r.exit_code == 0, r.output
    lines = r.stdout.splitlines()
    summary = [line for line in lines if "entries behave as recorded" in line]
    assert len(summary) == 1 and summary[0].endswith("evidence, not a proof")
    slowest = [line for line in lines if line.startswith("slowest: ")]
    assert len(slowest) == 1
    assert all(f"durfee-rectangle m={m} (" in slowest[0] for m in range(1, 6))


def test_verify_only_with_a_value_that_matches_nothing_is_refused():
    # two --only values, one mistyped: verify ran the other and reported success
    r = run("verify", "--only", "euler-pentagonal", "--only", "euler-pentagonl", "-n", "20")
    assert r.exit_code == 2
    assert "euler-pentagonl" in r.stderr and "did you mean euler-pentagonal?" in r.stderr
    # a family named with part of a member's parameters: the members it may mean
    r = run("verify", "--only", "andrews-gordon k=3", "-n", "20")
    assert r.exit_code == 2 and "andrews-gordon k=3 i=1" in r.stderr


def test_verify_malformed_file_exits_2_with_file_and_line(tmp_path):
    bad = tmp_path / "bad.toml"
    bad.write_text('[[identity]]\nkey = "x"\ntitle = "t"\nleft = "q"\nright = "q"\n'
                   'order = 10\nsource = "s"\nauthor = "me"\n')
    r = run("verify", str(bad))
    assert r.exit_code == 2
    assert f"{bad}:8:" in r.stderr and "unknown field 'author'" in r.stderr


def test_list_shows_identifiers_and_sources():
    r = run("list", "--json")
    assert r.exit_code == 0
    rows = json.loads(r.stdout)["identities"]
    keys = {row["id"] for row in rows}
    assert {"rogers-ramanujan-1", "andrews-gordon", "jacobi-cube"} <= keys
    assert all(row["source"] for row in rows)
    ag = next(row for row in rows if row["id"] == "andrews-gordon")
    assert ag["members"] == 2 + 3 + 4 + 5


def test_product_command():
    # the first Rogers-Ramanujan identity (Andrews 1976, ch. 7): exponent -1 at n = 1, 4 mod 5,
    # for the 199 factors 1 - q^n, n < 200
    r = run("product", "sum_{k>=0} q^(k^2)/(q;q)_k", "-n", "200", "--json")
    assert r.exit_code == 0
    data = json.loads(r.stdout)     # the shape in detail: tests/report/test_json_shapes.py
    assert data["period"] == 5 and data["expression"] == "(q, q^4;q^5)_inf^-1"
    # the printed form round-trips through check
    assert run("check", "sum_{k>=0} q^(k^2)/(q;q)_k", data["expression"], "-n", "200"
               ).exit_code == 0
    r = run("product", "1 + 2q", "-n", "30")
    assert r.exit_code == 1 and "no product form" in r.stdout
    assert run("product", "1/(q", "-n", "30").exit_code == 2


def test_product_reads_the_parts_and_refuses_extra_variables(monkeypatch):
    # issue 19: the command hands product_form the numerator and denominator of the sum
    # (binary splitting), whose exponents come by the verified log derivative: the exact
    # inverse of the value (the reference) is never needed for a product form
    import sys as _sys
    module = _sys.modules["qseries.analysis.product_form"]

    def refuse(*_args):
        raise AssertionError("the reference exponents_of was called")

    monkeypatch.setattr(module, "exponents_of", refuse)
    import qseries.cli.main as cli_main
    seen = []

    def spy(expr, order):
        seen.append(expr)
        return module.product_form(expr, order)

    monkeypatch.setattr(cli_main, "product_form", spy)
    # Rogers-Ramanujan's second identity (Andrews, The Theory of Partitions, Cor. 7.9)
    r = run("product", "sum_{k>=0} q^(k^2+k)/(q;q)_k", "-n", "400", "--json")
    assert r.exit_code == 0 and json.loads(r.stdout)["expression"] == "(q^2, q^3;q^5)_inf^-1"
    assert isinstance(seen[0], tuple) and seen[0][1] is not None
    r = run("product", "(z q;q)_inf", "-n", "10")
    assert r.exit_code == 2 and "extra variables z" in r.output


def test_check_prints_hints_at_a_mismatch():
    r = run("check", "(-q;q)_inf", "1/(q^2;q^4)_inf", "-n", "100")
    assert r.exit_code == 1 and "hint (dilation)" in r.stdout


def test_check_modular_method_json():
    r = run("check", *RR1, "-n", "6000", "--json")
    data = json.loads(r.stdout)
    assert r.exit_code == 0 and data["method"] == "modular" and len(data["primes"]) == 3
    r = run("check", *RR1, "-n", "300", "--method", "modular", "--primes", "2", "--json")
    data = json.loads(r.stdout)
    assert data["method"] == "modular" and len(data["primes"]) == 2
    assert run("check", "q", "q", "--method", "bogus").exit_code == 2


def test_expand_prints_polynomial_coefficients():
    import sympy
    q, z = sympy.symbols("q z")
    r = run("expand", "(z q, q/z, q;q)_inf", "-n", "4", "--json")
    assert r.exit_code == 0
    assert json.loads(r.stdout)["terms"] == [[0, "1"], [1, "-z - 1 - z^-1"],
                                             [3, "z^2 + z + 1 + z^-1 + z^-2"]]
    # sympy's expansion of the factors j = 1, 2, 3 (the others are 1 + O(q^4))
    ref = sympy.expand(sympy.prod([(1 - z * q**j) * (1 - q**j / z) * (1 - q**j)
                                   for j in range(1, 4)]))
    assert [ref.coeff(q, e) for e in range(4)] == [1, -z - 1 - 1 / z, 0,
                                                   z**2 + z + 1 + 1 / z + z**-2]
    r = run("expand", "1/(1-z)", "-n", "3", "--weight", "z=1")
    assert r.stdout.strip() == "1 + z*q + z^2*q^2 + O(q^3)"


def test_check_with_extra_variables_reports_variables_and_weights():
    # Euler: sum z^k/(q;q)_k = 1/(z;q)_inf (Andrews 1976, Cor. 2.2, from memory); against
    # 1/(z q;q)_inf the k = 1 term z/(1-q) gives z at q^0, weighted degree 1, where
    # 1/(z q;q)_inf has nothing (its z comes with q)
    r = run("check", "sum_{k>=0} z^k/(q;q)_k", "1/(z;q)_inf", "-n", "30", "--json")
    data = json.loads(r.stdout)
    assert r.exit_code == 0 and data["variables"] == ["z"] and data["weights"] == [1]
    r = run("check", "sum_{k>=0} z^k/(q;q)_k", "1/(z q;q)_inf", "-n", "30", "--json")
    data = json.loads(r.stdout)
    assert r.exit_code == 1 and data["first_mismatch"] == {"index": 1, "lhs": "z", "rhs": "0"}
    r = run("check", "sum_{k>=0} z^k/(q;q)_k", "1/(z q;q)_inf", "-n", "30")
    assert r.exit_code == 1 and "weighted degree 1" in r.stdout


@pytest.mark.parametrize("weight", ["z", "z=-1", "q=1", "zz=1", "z=1x", "a=1"])
def test_bad_weights_exit_2(weight):
    r = run("check", "z", "z", "--weight", weight)
    assert r.exit_code == 2 and "Traceback" not in r.output


def test_distribution_command(tmp_path):
    # by hand: of the 5 partitions of 4, 4, 31, 211, 1111 have a Durfee square of side 1 and
    # 22 one of side 2 (mean 6/5, variance 4/25); of 2: 2 and 11, both side 1
    durfee = "sum_{k>=0} z^k q^(k^2)/(q;q)_k^2"
    r = run("distribution", durfee, "--at", "4")
    assert r.exit_code == 0
    # the renderings in detail: tests/report/test_distribution.py and test_json_shapes.py
    assert "n = 4: 5 objects" in r.stdout
    r = run("distribution", durfee, "--at", "4", "--json")
    assert json.loads(r.stdout)["sizes"][0]["counts"] == {"1": "4", "2": "1"}
    out = tmp_path / "trend.csv"
    r = run("distribution", durfee, "--trend-upto", "5", "--out", str(out))
    assert r.exit_code == 0
    assert out.read_text().splitlines()[4].startswith("4,5,6/5,4/25")
    r = run("distribution", durfee, "--trend-upto", "2", "--format", "json")
    assert json.loads(r.stdout)[1]["mean"] == "1"
    for bad in (["distribution", durfee], ["distribution", "1/(q;q)_inf", "--at", "3"],
                ["distribution", durfee, "--var", "a", "--at", "3"]):
        r = run(*bad)
        assert r.exit_code == 2 and "Traceback" not in r.output


def test_distribution_trend_under_json_is_json():
    # --trend-upto with --json printed the CSV table (--format defaulted to csv)
    durfee = "sum_{k>=0} z^k q^(k^2)/(q;q)_k^2"
    r = run("distribution", durfee, "--trend-upto", "4", "--json")
    assert r.exit_code == 0
    rows = json.loads(r.stdout)
    # of the 5 partitions of 4, four have a Durfee square of side 1 and one of side 2
    assert rows[3]["n"] == 4 and rows[3]["mean"] == "6/5" and rows[3]["variance"] == "4/25"
    r = run("distribution", durfee, "--trend-upto", "4", "--json", "--format", "csv")
    assert r.stdout.startswith("n,total,mean,variance")          # asked for by name


def test_weighted_mismatch_exit_1():
    # the rendering in q and z: tests/report/test_verdict.py
    r = run("check", "1/(1-z)", "1/(1-z) + z^3 q", "-n", "10", "--weight", "z=2")
    assert r.exit_code == 1 and "weighted degree 7" in r.stdout


# -- an estimate before a long run (issue 11: --order up to 10^7 ran for minutes) ----------
def test_an_order_out_of_reach_is_refused_up_front_with_the_estimate():
    r = run("expand", "-n", "10000000", "1/(q;q)_inf")
    assert r.exit_code == 2
    assert "would take about" in r.output and "--allow-long" in r.output
    assert "GB" in r.output or "TB" in r.output


@pytest.mark.parametrize("args", [
    ["expand", "q"],
    ["check", "q", "q"],
    ["product", "(q;q)_inf"],
    ["distribution", "1/(z*q;q)_inf", "--at", "5"],
])
def test_every_command_with_an_order_estimates_and_allow_long_skips_it(monkeypatch, args):
    import qseries.cli.main as cli
    from qseries.engine.cost import CostEstimate

    asked = []

    def huge(expr, order, ring=None, weights=None, then=None):
        asked.append(order)
        return CostEstimate(order, 10**6, 10**12, 1024, 0.5)

    monkeypatch.setattr(cli, "estimate_cost", huge)
    r = run(*args)
    # 10^6 s is 11.6 days; check evaluates both sides
    assert r.exit_code == 2 and ("would take about 11.6 days" in r.output
                                 or "would take about 23.1 days" in r.output), r.output
    assert asked
    asked.clear()
    r = run(*args, "--allow-long")
    assert r.exit_code in (0, 1) and asked == []


def test_product_refuses_an_order_beyond_its_limit_up_front():
    # issue 11: product -n 9999999 "(q;q)_inf" ran for minutes and took gigabytes: (q;q)_inf
    # itself is cheap, but the exponents need its inverse, with coefficients of thousands of
    # digits, a working memory the probes of the estimate cannot see
    from qseries.engine.chooser import PRODUCT_MAX_ORDER

    r = run("product", "-n", "9999999", "(q;q)_inf")
    assert r.exit_code == 2, r.output
    assert f"up to order {PRODUCT_MAX_ORDER}" in r.output and "--allow-long" in r.output


def test_the_product_estimate_times_the_recovery_of_the_exponents(monkeypatch):
    import qseries.cli.main as cli

    seen = []

    def spy(expr, order, ring=None, weights=None, then=None):
        seen.append(then)
        return None

    monkeypatch.setattr(cli, "estimate_cost", spy)
    assert run("product", "-n", "60000", "(q;q)_inf").exit_code == 0
    assert seen == [cli.product_form]


def test_the_product_estimate_includes_the_recovery_of_the_exponents_on_a_fake_clock(monkeypatch):
    # (q;q)_inf itself is cheap at order 10^7 (Euler's pentagonal numbers), but recovering
    # its exponents means the log-derivative of a series with coefficients of thousands of
    # digits: the estimate must time that work too, not only the evaluation.  On the real
    # clock the growth exponent fitted to two probes of a fraction of a second is noise: on a
    # loaded machine the estimate ranged from 27 minutes to 11 days, and below 10 minutes the
    # run starts (it grew past 18 GB).  So the clock is faked here: only the recovery of the
    # exponents (the product form) takes time, quadratic in the order; if the probes did not
    # time it, the estimate would be 0 s and 81 MB, and the command would go on.
    import qseries.cli.main as cli
    from qseries.engine import cost

    from ..catalogue.limits import deadline, memory_cap

    clock = [0.0]
    recovered = []

    def recovery(series, order=None):
        n = series.precision
        recovered.append(n)
        clock[0] += 0.1 * (n / 1024) ** 2
        assert n <= 150000 // 4, "the run was not refused"

    monkeypatch.setattr(cost.time, "perf_counter", lambda: clock[0])
    monkeypatch.setattr(cli, "product_form", recovery)
    with deadline(60), memory_cap(2 << 30):
        r = run("product", "-n", "150000", "(q;q)_inf")
    assert r.exit_code == 2, r.output
    assert "would take about" in r.output and "--allow-long" in r.output
    assert recovered and max(recovered) <= 150000 // 4      # probes only


def test_the_distribution_refusal_names_the_options_that_set_the_sizes(monkeypatch):
    import qseries.cli.main as cli
    from qseries.engine.cost import CostEstimate

    monkeypatch.setattr(cli, "estimate_cost", lambda e, n, *a: CostEstimate(n, 1e6, 1, 9, 1.0))
    r = run("distribution", "1/(z*q;q)_inf", "--trend-upto", "100000")
    assert r.exit_code == 2
    assert "--trend-upto" in r.output and "--order" not in r.output


# -- --define (issue 13, item 3) ------------------------------------------------------------
G_SUM = "G(q) = sum_{n>=0} q^(n^2)/(q;q)_n"
H_SUM = "H(q) = sum_{n>=0} q^(n^2+n)/(q;q)_n"


def test_define_lets_both_sides_call_a_function_at_any_argument():
    # Berndt et al., Ramanujan's forty identities, Mem. AMS 188 (2007), no. 880, (1.4):
    # H(q) G(q^11) - q^2 G(q) H(q^11) = 1, with G, H the Rogers-Ramanujan sums
    r = run("check", "-D", G_SUM, "--define", H_SUM, "H(q) G(q^11) - q^2 G(q) H(q^11)", "1",
            "-n", "200")
    assert r.exit_code == 0, r.output
    assert "AGREES" in r.stdout


@pytest.mark.parametrize(("cmd", "define"), [
    (["expand", "G(-q)"], G_SUM),
    (["product", "G(q^2)"], G_SUM),
    (["congruences", "G(q)", "-n", "100"], G_SUM),
    (["congruences", "[q^(5n+4)] P(q)", "-M", "5", "-n", "50"], "P(q) = 1/(q;q)_inf"),
    (["relations", "G(q)", "1/((q;q^5)_inf (q^4;q^5)_inf)", "-n", "60"], G_SUM),
    (["express", "G(q)", "1/((q;q^5)_inf (q^4;q^5)_inf)", "-n", "60"], G_SUM),
    (["distribution", "D(z)", "--at", "4"], "D(z) = sum_{k>=0} z^k q^(k^2)/(q;q)_k^2"),
])
def test_every_command_taking_an_expression_takes_define(cmd, define):
    r = run(*cmd, "--define", define)
    assert r.exit_code == 0, r.output


@pytest.mark.parametrize(("defines", "words"), [
    (["G(q) = H(q)", "H(q) = G(q^2)"], "cycle: G -> H -> G"),
    (["G(q) = 1/(1-q"], "column 14"),
    (["eta(q) = 1"], "already a name"),
])
def test_a_bad_definition_exits_2_with_the_position(defines, words):
    args = [x for d in defines for x in ("--define", d)]
    r = run("expand", *args, "G(q)")
    assert r.exit_code == 2
    assert words in r.output and "Traceback" not in r.output


def test_an_undefined_function_exits_2_and_says_how_to_define_it():
    r = run("expand", "G(q) H(q)")
    assert r.exit_code == 2
    assert "unknown function 'G'" in r.output and "G(q) = ..." in r.output


# -- errors as JSON (issue 13, item 6) --------------------------------------------------------
@pytest.mark.parametrize(("args", "position", "text"), [
    (["expand", "1/(q"], 4, "1/(q"),
    (["check", "Sum_{k>=0} q", "q"], 0, "Sum_{k>=0} q"),
    (["product", "q + G(q)"], 4, "q + G(q)"),
    # undefined rather than malformed: the evaluator's error carries the position too (and
    # the text it points into)
    (["expand", "1/0"], 2, "1/0"),
    (["expand", "q + q^(q)"], 7, "q + q^(q)"),
    (["expand", "sum_{n>=0} q^n/(1-1)"], 17, "sum_{n>=0} q^n/(1-1)"),
])
def test_with_json_an_error_is_json_with_its_position(args, position, text):
    r = run(*args, "--json")
    assert r.exit_code == 2
    err = json.loads(r.stdout)["error"]
    assert err["message"] and "Traceback" not in err["message"]
    assert err["position"] == position and err.get("text") == text
    # the same command without --json: the text form, on standard error
    r = run(*args)
    assert r.exit_code == 2 and r.stdout == "" and "qseries: error:" in r.output


@pytest.mark.parametrize(("args", "position", "text"), [
    # an identity pasted as one argument: the column of an evaluation error counted into the
    # right side, while the user sees one text ("division by zero at column 12" pointed into
    # the left side); the side's text now comes with it, as for a parse error
    (["check", "sum_{n>=0} q^n = 1/(1-q)/(1-1)"], 11, " 1/(1-q)/(1-1)"),
    (["check", "1/(1-1)", "1"], 4, "1/(1-1)"),
    (["check", "1", "q + 1/(1-1)"], 8, "q + 1/(1-1)"),
    (["expand", "q + 1/(q-q)"], 8, "q + 1/(q-q)"),
])
def test_an_evaluation_error_comes_with_the_text_it_points_into(args, position, text):
    r = run(*args, "--json")
    assert r.exit_code == 2
    err = json.loads(r.stdout)["error"]
    assert err["position"] == position and err["text"] == text
    r = run(*args)
    lines = r.stderr.splitlines()
    assert r.exit_code == 2 and lines[1] == "  " + text
    assert lines[2] == "  " + " " * position + "^"


def test_latex_output_of_expand_product_and_check():
    r = run("expand", "(q;q)_inf^3", "-n", "11", "--latex")
    assert r.stdout.strip() == \
        r"\[ (q;q)_\infty^{3} = 1 - 3 q + 5 q^{3} - 7 q^{6} + 9 q^{10} + O(q^{11}) \]"
    # the display reads back whole: Jacobi's (q;q)^3 = sum (-1)^n (2n+1) q^(n(n+1)/2)
    # (Andrews, The Theory of Partitions, Theorem 2.8 (from memory)) to the order printed
    back = run("check", r.stdout.strip(), "-n", "11")
    assert back.exit_code == 0 and "AGREES" in back.stdout
    r = run("product", "sum_{k>=0} q^(k^2)/(q;q)_k", "-n", "60", "--latex")
    assert r.exit_code == 0 and "\\frac{1}{(q, q^{4};q^{5})_\\infty}" in r.stdout
    back = run("check", "sum_{k>=0} q^(k^2)/(q;q)_k", r.stdout.strip(), "-n", "60")
    assert back.exit_code == 0 and "agree to O(q^60)" in back.stdout
    r = run("check", "(q;q)_inf", "sum_{n=-inf}^{inf} (-1)^n q^(n(3n-1)/2)", "--latex")
    assert r.exit_code == 0 and r.stdout.startswith("% AGREES")


def test_expand_extractor_gives_partitions_in_a_progression():
    """The scripted form of issue 14: p(5n+4) as the coefficient of q^n."""
    from qseries.backend import partitions_p

    r = run("expand", "[q^(5n+4)] 1/(q;q)_inf", "--order", "100", "--json")
    assert r.exit_code == 0
    data = json.loads(r.stdout)
    assert data["order"] == 100
    assert data["terms"] == [[n, str(partitions_p(5 * n + 4))] for n in range(100)]
    latex = run("expand", r"[q^{5n+4}] \frac{1}{(q;q)_\infty}", "--order", "100", "--json")
    assert json.loads(latex.stdout) == data


def test_expand_dissect_option():
    from qseries.backend import partitions_p

    r = run("expand", "1/(q;q)_inf", "--order", "30", "--dissect", "7", "--json")
    assert r.exit_code == 0
    data = json.loads(r.stdout)
    assert data["order"] == 30 and data["m"] == 7 and len(data["parts"]) == 7
    for part in data["parts"]:
        want = [[n, str(partitions_p(7 * n + part["r"]))] for n in range(30)]
        assert part["terms"] == want
    text = run("expand", "1/(q;q)_inf", "-n", "3", "--dissect", "2")
    assert text.stdout.splitlines() == ["r=0: 1 + 2q + 5q^2 + O(q^3)",
                                        "r=1: 1 + 3q + 7q^2 + O(q^3)"]


@pytest.mark.parametrize("args", [
    ("expand", "[q^(5n+4)] eta(q)"),
    ("expand", "[q^(5n+4) 1/(q;q)_inf"),
    ("expand", "1/(q;q)_inf", "--dissect", "0"),
])
def test_expand_extractor_errors_exit_2(args):
    r = run(*args)
    assert r.exit_code == 2 and "Traceback" not in r.output


def test_congruences_search_json():
    """Ramanujan's three (Andrews, The Theory of Partitions, Ch. 10; from memory)."""
    r = run("congruences", "1/(q;q)_inf", "--order", "2000", "--json")
    assert r.exit_code == 0
    assert json.loads(r.stdout) == {"order": 2000, "congruences": [
        {"m": 5, "r": 4, "modulus": 5}, {"m": 7, "r": 5, "modulus": 7},
        {"m": 11, "r": 6, "modulus": 11}]}
    r = run("congruences", "1/(q;q)_inf", "-n", "3000", "--moduli", "5, 25", "--max-step", "25")
    assert r.exit_code == 0
    assert r.stdout.splitlines()[1:] == ["a(5n + 4) = 0 (mod 5)  on 600 coefficients",
                                         "a(25n + 24) = 0 (mod 25)  on 120 coefficients"]


def test_congruences_test_mode_exit_codes():
    ok = run("congruences", "[q^(5n+4)] 1/(q;q)_inf", "--modulus", "5", "-n", "5000")
    assert ok.exit_code == 0 and "divisible" in ok.stdout
    same = run("congruences", "1/(q;q)_inf", "-M", "5", "--step", "5", "--residue", "4",
               "-n", "5000", "--json")
    assert same.exit_code == 0 and json.loads(same.stdout)["divisible"] is True
    bad = run("congruences", "1/(q;q)_inf", "-M", "7", "--step", "5", "--residue", "4",
              "--json")
    assert bad.exit_code == 1
    assert json.loads(bad.stdout)["counterexample"] == {"n": 0, "exponent": 4, "residue": 5,
                                                        "value": None}
    frac = run("congruences", "q^(-1/24)/(q;q)_inf", "-M", "5", "--step", "5", "--residue",
               "95/24")
    assert frac.exit_code == 0


@pytest.mark.parametrize("args, words", [
    (("1/(q;q)_inf", "-M", "1"), "--modulus"),
    (("1/(q;q)_inf", "-M", "5", "--step", "0"), "--step"),
    (("1/(q;q)_inf", "-M", "5", "--step", "5", "--residue", "5"), "0 <= r < m"),
    (("1/(q;q)_inf", "-M", "5", "--residue", "x"), "--residue"),
    (("1/(q;q)_inf", "--moduli", "5,x"), "--moduli"),
    (("1/(q;q)_inf", "--moduli", "1"), "modulus"),
    (("1/(q;q)_inf", "--step", "5"), "go with --modulus"),
    (("1/(q;q", "-M", "5"), "column 7"),
    (("eta(q)",), "integer powers"),
])
def test_congruences_bad_input_exit_2(args, words):
    r = run("congruences", *args)
    assert r.exit_code == 2 and "Traceback" not in r.output
    assert words in r.output


def test_relations_command():
    r = run("relations", "theta_3(q)^4", "theta_2(q)^4", "theta_4(q)^4", "-n", "200", "--json")
    assert r.exit_code == 0
    data = json.loads(r.stdout)
    assert data["order"] == 200 and data["relations"] == [["1", "-1", "-1"]]
    none = run("relations", "1/(q;q)_inf", "(q;q)_inf")
    assert none.exit_code == 1 and none.stdout.startswith("no integer relation")
    short = run("relations", "1/(q;q)_inf", "(q;q)_inf", "-n", "1")
    assert short.exit_code == 2 and "raise the order" in short.output
    bad = run("relations", "(q;q", "q")
    assert bad.exit_code == 2 and "column" in bad.output and "Traceback" not in bad.output


def test_series_in_a_fractional_power_of_q():
    # issue 13, item 5: theta_2(q) + theta_3(q) = sum_{n in Z} q^(n^2/4) (the odd and even
    # squares, from the definitions), and Euler's pentagonal number theorem times q^(1/3)
    r = run("expand", "theta_2(q) + theta_3(q)", "-n", "5", "--json")
    assert r.exit_code == 0, r.output
    assert json.loads(r.stdout)["terms"] == [[0, "1"], ["1/4", "2"], [1, "2"], ["9/4", "2"],
                                             [4, "2"]]
    euler = run("check", "q^(1/3) (q;q)_inf + 1",
                "1 + sum_{k=-inf}^{inf} (-1)^k q^(k(3k-1)/2 + 1/3)", "-n", "400")
    assert euler.exit_code == 0 and euler.stdout.startswith("AGREES")
    wrong = run("check", "theta_2(q) + theta_3(q)", "sum_{n=-inf}^{inf} q^(n^2/4) + q^(7/4)",
                "-n", "100")
    assert wrong.exit_code == 1 and "first at q^(7/4)" in wrong.stdout


def test_express_command():
    # sum_n p(7n+5) q^n = 7 (q^7;q^7)^3/(q;q)^4 + 49 q (q^7;q^7)^7/(q;q)^8 (Ramanujan 1919;
    # from memory)
    r = run("express", "[q^(7n+5)] 1/(q;q)_inf", "(q^7;q^7)_inf^3/(q;q)_inf^4",
            "q (q^7;q^7)_inf^7/(q;q)_inf^8", "-n", "150", "--json")
    assert r.exit_code == 0, r.output
    data = json.loads(r.stdout)
    assert data["order"] == 150 and data["coefficients"] == ["7", "49"]
    assert data["basis"] == ["(q^7;q^7)_inf^3/(q;q)_inf^4", "q (q^7;q^7)_inf^7/(q;q)_inf^8"]
    half = run("express", "1/(1-q^2)", "1/(1-q)", "1/(1+q)", "-n", "40")
    assert half.exit_code == 0 and "1/2 (1/(1-q))" in half.stdout
    none = run("express", "(q;q)_inf", "1", "q")
    assert none.exit_code == 1 and none.stdout.startswith("no combination")
    dependent = run("express", "q", "1/(1-q)", "2/(1-q)")
    assert dependent.exit_code == 2 and "linearly dependent" in dependent.output
    bad = run("express", "q", "(q;q", "--json")
    assert bad.exit_code == 2 and json.loads(bad.stdout)["error"]["position"] is not None


def test_version_names_the_installed_versions():
    # issue 16: there was no --version; the figures come from the installed distributions
    from importlib.metadata import version

    import flint
    r = run("--version")
    assert r.exit_code == 0
    assert r.stdout.startswith(f"qseries {version('qseries')} ")
    assert f"python-flint {flint.__version__}" in r.stdout


def test_check_json_seconds_cover_the_whole_command(monkeypatch):
    # issue 19, item 6: ``seconds`` is the time of the whole command (the hints included),
    # read here from a fake clock: start of the command at 1000, end at 1042.5
    import types

    import qseries.cli.main as main
    clock = iter([1000.0, 1042.5])
    monkeypatch.setattr(main, "time", types.SimpleNamespace(perf_counter=lambda: next(clock)))
    r = run("check", RR1[0], RR1[1] + " - q^150", "--order", "151", "--json")
    assert r.exit_code == 1
    assert json.loads(r.stdout)["seconds"] == 42.5


# -- pictures (--plot; the drawings themselves: tests/report/test_plots.py) ---------------
@pytest.mark.parametrize("args, name", [
    (["expand", "1/(q;q)_inf", "-n", "200"], "expand.png"),
    (["product", RR1[0], "-n", "100"], "product.svg"),
    (["distribution", "sum_{k>=0} z^k q^(k^2)/(q;q)_k^2", "--at", "50", "--at", "80"],
     "distribution.png"),
    (["check", RR1[0], "1/((q;q^5)_inf (q^4;q^5)_inf (q^30;q^30)_inf)", "-n", "80"],
     "check.svg"),
])
def test_plot_option_writes_a_picture(tmp_path, args, name):
    path = tmp_path / name
    r = run(*args, "--plot", str(path))
    assert r.exit_code == (1 if args[0] == "check" else 0), r.output
    data = path.read_bytes()
    assert data.startswith(b"\x89PNG\r\n\x1a\n") if name.endswith(".png") else b"<svg" in data
    assert 5_000 < len(data) < 2_000_000
    assert f"wrote {path}" in r.stderr


def test_plot_option_refusals(tmp_path):
    r = run("expand", "1/(1-q)", "--plot", str(tmp_path / "x.jpg"))
    assert r.exit_code == 2 and "PNG or SVG" in r.stderr
    r = run("check", *RR1, "-n", "50", "--plot", str(tmp_path / "agree.png"))
    assert r.exit_code == 0 and "no picture" in r.stderr and not (tmp_path / "agree.png").exists()
    r = run("distribution", "1/(z*q;q)_inf", "--at", "5", "--fit", "sqrt", "--plot",
            str(tmp_path / "d.png"))
    assert r.exit_code == 2 and "--trend-upto" in r.stderr
    r = run("distribution", "1/(z*q;q)_inf", "--trend-upto", "9", "--fit", "cube", "--plot",
            str(tmp_path / "d.png"))
    assert r.exit_code == 2 and "fit must be one of" in r.stderr


def test_plot_of_the_trend(tmp_path):
    path = tmp_path / "trend.png"
    r = run("distribution", "1/(z*q;q)_inf", "--trend-upto", "80", "--fit", "sqrt", "--plot",
            str(path), "--out", str(tmp_path / "trend.csv"))
    assert r.exit_code == 0, r.output
    assert path.read_bytes().startswith(b"\x89PNG") and path.stat().st_size > 5_000


def test_distribution_out_writes_every_count_of_the_sizes(tmp_path):
    # Durfee squares of the partitions of 10: 10, 30, 2 (p(10) = 42, A000041)
    out = tmp_path / "counts.csv"
    r = run("distribution", "sum_{k>=0} z^k q^(k^2)/(q;q)_k^2", "--at", "10", "--at", "4",
            "--out", str(out))
    assert r.exit_code == 0 and "mode z = 2" in r.stdout
    rows = out.read_text().splitlines()
    assert rows[0] == "n,z,count,share"
    assert rows[1:4] == ["10,1,10,0.2380952381", "10,2,30,0.7142857143", "10,3,2,0.04761904762"]
    assert sum(int(row.split(",")[2]) for row in rows if row.startswith("4,")) == 5   # p(4)


def test_the_command_list_wraps_sentences_only_at_the_width():
    # issue 16: the list kept the docstrings' line breaks, which fall inside sentences
    # (the test runner sets the width to 80 columns)
    r = runner.invoke(app, ["--help"])
    assert r.exit_code == 0
    lines = r.stdout.splitlines()
    first = next(i for i, x in enumerate(lines) if x.lstrip().startswith("expand "))
    entry = [lines[first]]
    for x in lines[first + 1:]:
        if not x.startswith(" " * 10):          # the next command's name
            break
        entry.append(x)
    assert "Letters other than q that no sum binds are extra variables" in \
        " ".join(x.strip() for x in entry)
    assert all(len(x) > 60 for x in entry[:-1])          # broken at the width only


def test_help_texts_keep_the_notation_in_brackets():
    # "[q^(5n+4)] F" was read as rich markup and vanished from the help
    for command in ("express", "congruences"):
        r = runner.invoke(app, [command, "--help"])
        assert "[q^(" in r.stdout, command


def test_a_residue_without_a_step_is_refused_with_the_reason():
    # found by a trial: the message spoke of "0 <= r < m = 1" instead of the missing --step
    r = run("congruences", "1/(q;q)_inf", "--modulus", "5", "--residue", "4")
    assert r.exit_code == 2 and "needs --step" in r.stderr


def test_check_takes_an_identity_pasted_whole():
    r = run("check", r"\sum_{k\ge0} \frac{q^{k^2}}{(q;q)_k} &= \frac{1}{(q,q^4;q^5)_\infty}.",
            "-n", "100")
    assert r.exit_code == 0 and r.stdout.startswith("AGREES")
    r = run("check", "sum_{k>=0} q^(k^2)/(q;q)_k", "-n", "100")          # no right side
    assert r.exit_code == 2 and "two sides" in r.stderr


@pytest.mark.parametrize("args", [
    ["check", "1/(q;q)_inf", "1", "-n", "0", "--json"],        # an option out of range
    ["check", "1", "1", "--method", "fast", "--json"],         # a choice not offered
    ["list", "--json", "--bogus"],                              # an unknown option
])
def test_usage_errors_under_json_are_json(args):
    # found by a trial as a new user: click's usage errors came as boxed text under --json
    done = subprocess.run([sys.executable, "-m", "qseries", *args], capture_output=True,
                          text=True, timeout=120)
    assert done.returncode == 2
    error = json.loads(done.stdout)["error"]
    assert error["message"] and "Traceback" not in done.stderr


def test_expand_suggests_a_weight_when_one_may_help():
    # found by a trial: check retries with a weight, expand only said "does not converge"
    r = run("expand", "sum_{n>=0} z^n/(q;q)_n", "-n", "5")
    assert r.exit_code == 2 and "try -w z=1" in r.stderr
    assert run("expand", "sum_{n>=0} z^n/(q;q)_n", "-n", "5", "-w", "z=1").exit_code == 0
    r = run("expand", "sum_{n>=0} 1/(q;q)_n", "-n", "5")        # no variable, no such hint
    assert r.exit_code == 2 and "-w" not in r.stderr


def _command_names() -> list[str]:
    import typer.main

    return list(typer.main.get_command(app).commands)


def test_a_command_alone_runs_and_helps_as_in_the_whole_app():
    # run() builds only the command named first (typer turns every registered command into
    # a click command on each run); the command's help, its parameters and a run are those
    # of the whole app's, and anything else (no command, an option, a typo) gets the app
    import typer.main

    from qseries.cli.main import _for_command

    whole = typer.main.get_command(app)
    names = _command_names()
    assert {"check", "expand", "verify", "prove", "scan", "list"} <= set(names)
    for name in names:
        alone = _for_command([name, "--help"])
        built = typer.main.get_command(alone)
        assert list(built.commands) == [name]
        assert [p.name for p in built.commands[name].params] == \
            [p.name for p in whole.commands[name].params]
        assert runner.invoke(alone, [name, "--help"]).stdout == \
            runner.invoke(app, [name, "--help"]).stdout
    for argv in ([], ["--help"], ["--version"], ["chek", "q", "q"], ["q"]):
        assert _for_command(argv) is app
    one = runner.invoke(_for_command(["check", "q", "q"]), ["check", "q", "q", "-n", "5"])
    whole = run("check", "q", "q", "-n", "5")          # the same but for the time taken
    assert one.exit_code == whole.exit_code == 0
    assert one.stdout.splitlines()[0] == whole.stdout.splitlines()[0]
    assert one.stdout.splitlines()[0].startswith("AGREES")


def test_the_command_line_does_not_load_what_its_command_does_not_use():
    # the modular-form proofs (only prove needs them), the notebook renderers (with the
    # standard library's html) and the demo's cases are imported when used, not with the
    # command line (a start-up cost of every command; README, Speed)
    probe = ("import sys, qseries.cli.main; "
             "print(sorted(m for m in sys.modules if m == 'html' or m.startswith("
             "('qseries.modularity', 'qseries.report.notebook', 'qseries.cli.demo'))))")
    done = subprocess.run([sys.executable, "-c", probe], capture_output=True, text=True,
                          timeout=120, check=True)
    assert done.stdout.strip() == "[]"
    # verify --json prints no rich table, so it does not import rich (a third of its start)
    probe = ("import sys, qseries.cli.main as m\n"
             "sys.argv = ['qseries', 'verify', '--only', 'rogers-ramanujan-1', '-n', '20', "
             "'-j', '1', '--json']\n"
             "try:\n    m.run()\nexcept SystemExit as done:\n    code = done.code\n"
             "print(code, 'rich' in sys.modules)\n")
    done = subprocess.run([sys.executable, "-c", probe], capture_output=True, text=True,
                          timeout=120, check=True)
    assert done.stdout.split()[-2:] == ["0", "False"]
    # and they still load when used: prove's module, the demo
    assert run("prove", "(q;q)_inf", "sum_{n=-inf}^{inf} (-1)^n q^(n(3n-1)/2)",
               "--json").exit_code == 0
    assert "Rogers-Ramanujan" in run("demo").stdout
