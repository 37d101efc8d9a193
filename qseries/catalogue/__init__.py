"""Identity files (TOML), their validation with file:line errors, and batch verification.

>>> from qseries.catalogue import SHIPPED
>>> SHIPPED.name
'identities'
"""

from pathlib import Path

from .files import Entry, IdentityFileError, load_entries, select
from .verify import EntryResult, verify_entries, verify_entry

#: the catalogue shipped with qseries
SHIPPED = Path(__file__).resolve().parent.parent.parent / "identities"

__all__ = ["SHIPPED", "Entry", "EntryResult", "IdentityFileError", "load_entries", "select",
           "verify_entries", "verify_entry"]
