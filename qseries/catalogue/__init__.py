"""Identity files (TOML), their validation with file:line errors, and batch verification.

The shipped catalogue, ``SHIPPED``, is the folder ``identities/`` at the top of the
repository; a wheel carries the same files as ``qseries/catalogue/identities/`` (see
``[tool.setuptools]`` in pyproject.toml), which is used when it is there.

>>> from qseries.catalogue import SHIPPED
>>> SHIPPED.name, (SHIPPED / "rogers_ramanujan.toml").is_file()
('identities', True)
"""

from pathlib import Path

from ..errors import IdentityFileError, TemplateError
from .files import Entry, SameAs, load_entries, select
from .verify import (
    EntryResult,
    VerifyInterrupted,
    job_count,
    pair_ident,
    verify_entries,
    verify_entry,
    verify_pair,
)


def _shipped() -> Path:
    here = Path(__file__).resolve().parent
    installed = here / "identities"          # inside a wheel
    return installed if installed.is_dir() else here.parent.parent / "identities"


#: the catalogue shipped with qseries
SHIPPED = _shipped()

__all__ = ["SHIPPED", "Entry", "EntryResult", "IdentityFileError", "SameAs", "TemplateError",
           "VerifyInterrupted", "job_count", "load_entries", "pair_ident", "select",
           "verify_entries", "verify_entry", "verify_pair"]
