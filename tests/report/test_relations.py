"""qseries.report.relations: the text of relations found."""

from qseries.analysis import express, relations
from qseries.report import combination_lines, relation_lines


def test_relation_lines():
    lines = relation_lines(relations(["theta_3(q)^4", "theta_2(q)^4", "theta_4(q)^4"], 100))
    assert lines == ["1 integer relation below q^100 (a reduced basis; 100 coefficients for 3 "
                     "unknowns, 97 beyond the unknowns confirm it):",
                     "(theta_3(q)^4) - (theta_2(q)^4) - (theta_4(q)^4) = 0"]
    poly = relation_lines(relations(["theta_3(q)", "theta_4(q)", "theta_4(q^2)"], 60, degree=2))
    assert poly[0].startswith("1 polynomial relation of degree <= 2 below q^60")


def test_combination_lines():
    found = combination_lines(express("[q^(5n+4)] 1/(q;q)_inf",
                                      ["(q^5;q^5)_inf^5/(q;q)_inf^6"], 100))
    assert found == ["a unique combination below q^100 (100 coefficients for 2 unknowns, 98 "
                     "beyond the unknowns confirm it):",
                     "([q^(5n+4)] 1/(q;q)_inf) = 5 ((q^5;q^5)_inf^5/(q;q)_inf^6)"]
    none = combination_lines(express("(q;q)_inf", ["1"], 30))
    assert none == ["no combination of the 1 basis series gives the target below q^30 "
                    "(30 coefficients for 2 unknowns)"]


def test_one_unknown_is_singular():
    # "200 coefficients for 1 unknowns" (qseries relations with one series)
    lines = relation_lines(relations(["theta_3(q)"], 30))
    assert lines == ["no integer relation below q^30 (30 coefficients for 1 unknown)"]


def test_polynomial_relations_are_plural_in_the_right_place():
    # "9 polynomial relation of degree <= 2s below ..."
    lines = relation_lines(relations(["theta_3(q)^2", "theta_3(q^2)^2", "theta_2(q^2)^2"], 60,
                                     degree=2))
    assert lines[0].split(" (")[0].endswith("polynomial relations of degree <= 2 below q^60")
