"""qseries.report.relations: the text of relations found."""

from qseries.analysis import relations
from qseries.report import relation_lines


def test_relation_lines():
    lines = relation_lines(relations(["theta_3(q)^4", "theta_2(q)^4", "theta_4(q)^4"], 100))
    assert lines == ["1 integer relation below q^100 (a reduced basis; 100 coefficients for 3 "
                     "unknowns, 97 beyond the unknowns confirm it):",
                     "(theta_3(q)^4) - (theta_2(q)^4) - (theta_4(q)^4) = 0"]
    poly = relation_lines(relations(["theta_3(q)", "theta_4(q)", "theta_4(q^2)"], 60, degree=2))
    assert poly[0].startswith("1 polynomial relation of degree <= 2 below q^60")
