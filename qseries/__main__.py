"""``python -m qseries``."""

from .cli.main import run

run()
