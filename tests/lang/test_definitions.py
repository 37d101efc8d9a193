"""Functions defined in the notation, substitution into named functions, and Ramanujan's
theta functions (issue 13, items 3 and 4)."""

import pytest

from qseries import check, evaluate, parse
from qseries.errors import ArgumentTypeError, DomainError, ParseError
from qseries.lang.definitions import parse_definitions
from qseries.products import FUNCTIONS

G = "G(q) = 1/((q;q^5)_inf (q^4;q^5)_inf)"
H = "H(q) = 1/((q^2;q^5)_inf (q^3;q^5)_inf)"


def test_a_definition_is_the_same_as_its_body_at_any_argument():
    for arg, body in [("q", "q"), ("q^2", "q^2"), ("-q", "-q"), ("-q^3", "-q^3")]:
        a = evaluate(f"G({arg})", 60, definitions=[G])
        b = evaluate(f"1/(({body};({body})^5)_inf (({body})^4;({body})^5)_inf)", 60)
        assert a == b, arg


def test_rogers_ramanujan_forty_identities_1_4_with_definitions():
    # Berndt et al., "Ramanujan's forty identities for the Rogers-Ramanujan functions",
    # Mem. AMS 188 (2007), no. 880, (1.4): H(q) G(q^11) - q^2 G(q) H(q^11) = 1
    r = check("H(q) G(q^11) - q^2 G(q) H(q^11)", "1", 300, definitions=[G, H])
    assert r.holds is True


def test_definitions_may_use_each_other_in_any_order():
    defs = ["R(q) = q^(1/5) H(q)/G(q)", H, G]
    # R is the Rogers-Ramanujan continued fraction; here only its definition is checked
    a = evaluate("R(q)", 30, definitions=defs)
    b = evaluate("q^(1/5) (q;q^5)_inf (q^4;q^5)_inf/((q^2;q^5)_inf (q^3;q^5)_inf)", 30)
    assert a == b


@pytest.mark.parametrize(("defs", "words"), [
    (["A(q) = B(q)", "B(q) = A(q^2)"], "cycle: A -> B -> A"),
    (["A(q) = A(q^2)"], "cycle: A -> A"),
    (["A(q) = 1", "A(q) = 2"], "defined twice"),
    (["eta(q) = 1"], "already a name"),
    # a subscripted head was only told "a definition reads NAME(q) = EXPRESSION"
    (["theta_3(q) = 1"], "'theta_3' is already a name"),
    ([r"\theta_3(q) = 1"], "'theta_3' is already a name"),
    (["G_1(q) = 1"], "write G1(q)"),
    (["A(q, q) = 1"], "appears twice"),
    (["A(qq) = 1"], "parameter"),
    (["A = 1"], "NAME(q) = EXPRESSION"),
    (["A(q) 1"], "expected '='"),
])
def test_bad_definitions_are_clear_errors(defs, words):
    with pytest.raises(ParseError) as info:
        parse_definitions(defs)
    assert words in str(info.value)


def test_definitions_must_be_a_list_of_texts():
    with pytest.raises(ArgumentTypeError):
        parse("G(q)", definitions="G(q) = 1")


def test_a_call_with_the_wrong_number_of_arguments_is_refused():
    with pytest.raises(ParseError, match="G takes 1 argument"):
        parse("G(q, q)", definitions=[G])


def test_bound_names_of_the_body_do_not_capture_the_argument():
    # P(x) = sum_n x^n; P(q^n) inside a sum over n must use the outer n
    defs = ["P(x) = sum_{n>=0} x^n"]
    a = evaluate("sum_{n>=1} q^n P(q^n)", 30, definitions=defs)
    b = evaluate("sum_{n>=1} q^n/(1-q^n)", 30)
    assert a == b


@pytest.mark.parametrize("text", ["f(-q)", "G(q) H(q)", "z(1-q)", "sinq(q)"])
def test_a_name_directly_before_a_parenthesis_is_never_a_product(text):
    # issue 13: f(-q) was read as f*(-q)
    with pytest.raises(ParseError, match="function") if text != "f(-q)" else _nothing():
        node = parse(text)
        assert node == parse("(q;q)_inf") or evaluate(node, 20) == evaluate("(q;q)_inf", 20)


class _nothing:
    def __enter__(self):
        return self

    def __exit__(self, *exc):
        return False


def test_a_space_keeps_juxtaposition():
    assert parse("z (1-q)") == parse("z*(1-q)")
    assert parse("q^(k(3k-1)/2)", bound=["k"]) == parse("q^(k*(3k-1)/2)", bound=["k"])


# -- Ramanujan's notation, B. C. Berndt, Ramanujan's Notebooks III, Ch. 16 (from memory) ---
@pytest.mark.parametrize(("lhs", "rhs"), [
    ("f(-q)", "(q;q)_inf"),                                  # Entry 22(iii)
    ("phi(q)", "theta_3(q)"),
    ("phi(-q)", "theta_4(q)"),
    ("psi(q)", "f(q, q^3)"),                                  # Entry 22(ii)
    ("f(q^2, q^3)", "(-q^2;q^5)_inf (-q^3;q^5)_inf (q^5;q^5)_inf"),   # Entry 19
    ("f(z q, q/z)", "(-z q;q^2)_inf (-q/z;q^2)_inf (q^2;q^2)_inf"),   # Entry 19, in z
    ("chi(-q)", "(q;q^2)_inf"),
    ("theta_3(-q^2)", "theta_4(q^2)"),
    ("theta_4(-q)", "theta_3(q)"),
])
def test_ramanujan_and_jacobi_notation(lhs, rhs):
    r = check(lhs, rhs, 120)
    assert r.holds is True, (lhs, rhs, r.first_mismatch)


def test_psi_is_the_generating_function_of_triangular_numbers():
    # psi(q) = sum_{n>=0} q^(n(n+1)/2): coefficient 1 exactly at triangular numbers
    s = evaluate("psi(q)", 200)
    tri = {n * (n + 1) // 2 for n in range(30)}
    assert s.coefficient_list(200) == [1 if k in tri else 0 for k in range(200)]


def test_functions_with_a_fractional_offset_refuse_minus_q():
    with pytest.raises(DomainError, match="fractional power"):
        evaluate("eta(-q)", 10)
    with pytest.raises(DomainError):
        evaluate("theta_2(-q)", 10)


def test_the_old_spellings_are_retired_with_a_suggestion():
    with pytest.raises(ParseError, match="did you mean theta_3"):
        parse("theta3(q)")


def test_every_registry_entry_names_a_source_and_its_example_evaluates():
    for entry in FUNCTIONS.values():
        assert entry.source, entry.name
        assert entry.build is not None or entry.definitions, entry.name
        evaluate(entry.example, 10)


def test_unknown_words_get_a_suggestion_not_their_letters():
    for word, near in [("Sum_{k>=0} q^k", "sum"), ("infty", "inf"), ("prd_{k>=0} q", "prod")]:
        with pytest.raises(ParseError) as info:
            parse(word)
        assert f"did you mean {near}?" in str(info.value)
        assert " S u m" not in str(info.value)


def test_letters_side_by_side_multiply_as_in_papers():
    # issue 13: "6ij" for 6 i j; LaTeX (zq;q)_\infty
    assert parse("sum_{i>=0} sum_{j>=0} q^(6ij)") == parse("sum_{i>=0} sum_{j>=0} q^(6*i*j)")
    assert parse("(zq;q)_inf") == parse("(z*q;q)_inf")


def test_multi_index_sums_share_the_range():
    a = evaluate("sum_{i,j>=0} q^(i^2+j^2)/((q;q)_i (q;q)_j)", 60)
    b = evaluate("(sum_{i>=0} q^(i^2)/(q;q)_i)^2", 60)
    assert a == b


def test_a_sum_at_minus_q_has_the_signs_of_q_to_minus_q():
    # q -> -q multiplies the coefficient of q^n by (-1)^n; the sum's (q;q)_n become
    # (-q;-q)_n, which the sum strategies leave to the direct evaluation
    rr = "G(q) = sum_{n>=0} q^(n^2)/(q;q)_n"
    plus = evaluate("G(q)", 80, definitions=[rr]).coefficient_list(80)
    minus = evaluate("G(-q)", 80, definitions=[rr]).coefficient_list(80)
    assert minus == [(-1) ** n * c for n, c in enumerate(plus)]


def test_chains_of_indices_and_subscripted_names_as_papers_print_them():
    # sum_{n1>=n2>=n3>=0} q^(n1+n2+n3) counts partitions into at most 3 parts: the
    # coefficient of q^n is the number of partitions of n into parts <= 3 (conjugation),
    # counted here by brute force
    s = evaluate(r"\sum_{n_1 \ge n_2 \ge n_3 \ge 0} q^{n_1+n_2+n_3}", 30)
    brute = [sum(1 for a in range(n + 1) for b in range(n + 1)
                 if a + 2 * b <= n and (n - a - 2 * b) % 3 == 0) for n in range(30)]
    assert s.coefficient_list(30) == brute
    assert parse("sum_{n1>=n2>=0} q^(n1 n2)") == parse(
        "sum_{n2>=0} sum_{n1>=n2} q^(n1 n2)")
    # a subscripted index reads back from its printed form
    node = parse("sum_{n_1>=0} q^(n_1)/(q;q)_{n_1}")
    from qseries.lang import show
    assert parse(show(node)) == node
    assert evaluate(node, 20) == evaluate("sum_{n>=0} q^n/(q;q)_n", 20)


@pytest.mark.parametrize(("text", "words"), [
    ("sum_{n_1, n_1>=0} q", "appears twice"),
    ("sum_{k>=0} sum_{k>=0} q", "already bound"),
])
def test_bad_index_lists_are_clear_errors(text, words):
    with pytest.raises(ParseError, match=words):
        parse(text)


def test_tau_outside_eta_is_not_read_as_t_a_u():
    with pytest.raises(ParseError, match="only inside eta"):
        parse("q^tau")
    assert parse("eta(5 tau)") == parse("eta(q^5)")


def test_theta_without_its_subscript_says_which_exist():
    with pytest.raises(ParseError, match="theta_2\\(q\\), theta_3\\(q\\) or theta_4\\(q\\)"):
        parse("theta(q)")


@pytest.mark.parametrize("word", ["alpha", "beta", "mu", "nu", "pi", "sigma", "abcd"])
def test_words_are_not_silently_read_as_products_of_letters(word):
    # the letters-side-by-side rule covers short runs (zq, 6ij); a Greek name or a longer
    # word is refused with a clear message instead of being read as a*l*p*h*a
    with pytest.raises(ParseError, match="unknown name"):
        parse(f"q^2 {word}")
