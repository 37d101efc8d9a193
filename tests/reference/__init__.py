"""An independent reference for the differential tests (issue 11).

Nothing in this package imports qseries: ``series`` is truncated Laurent/Puiseux series
arithmetic in Python ints and Fractions, ``expressions`` the tests' own expression trees, their
text in qseries' notation, their value by the reference, and hypothesis strategies for them.
"""
