"""The C allocator under FLINT: large blocks from the heap, and a pad kept at its top.

Every FLINT operation returns a new polynomial, so a long evaluation (a nested sum of N
terms makes a few polynomials of up to N words per term) allocates and frees blocks of
hundreds of kilobytes millions of times.  With glibc's defaults each freed block at the
top of the heap is given back to the system and the next allocation faults its pages in
again: on Euler's sum at order 20 000 over ZZ that was 3 million page faults and more
system time than computing.  ``keep_heap_pad`` asks glibc (``mallopt``) to serve blocks
up to ``HEAP_BLOCK`` bytes from the heap rather than from fresh mappings
(``M_MMAP_THRESHOLD``) and to keep ``HEAP_PAD`` bytes at the top of the heap when freeing
(``M_TOP_PAD``); it is called once when the backend is imported.  Elsewhere (macOS, musl,
Windows) it does nothing.

>>> keep_heap_pad() in (True, False)
True
"""

from __future__ import annotations

import ctypes
import os
import sys

__all__ = ["HEAP_PAD", "keep_heap_pad"]

#: bytes glibc keeps at the top of the heap (the process may hold this much unused memory)
HEAP_PAD = 64 << 20
#: blocks up to this size come from the heap (glibc's largest allowed value on 64 bits)
HEAP_BLOCK = 32 << 20
#: glibc's parameter numbers (malloc.h)
_M_TOP_PAD = -2
_M_MMAP_THRESHOLD = -3


def keep_heap_pad(pad: int = HEAP_PAD, block: int = HEAP_BLOCK) -> bool:
    """Ask glibc to serve blocks up to ``block`` bytes from the heap and to keep ``pad``
    bytes at its top; True when it did (Linux with glibc), False elsewhere or when the
    call is not available.

    >>> import platform
    >>> keep_heap_pad() == (sys.platform.startswith("linux") and platform.libc_ver()[0] == "glibc")
    True
    """
    if not sys.platform.startswith("linux") or _libc_name() != "glibc":
        return False
    try:
        mallopt = ctypes.CDLL(None).mallopt
    except (OSError, AttributeError):
        return False
    mallopt.argtypes = [ctypes.c_int, ctypes.c_int]
    mallopt.restype = ctypes.c_int
    return mallopt(_M_MMAP_THRESHOLD, block) == 1 and mallopt(_M_TOP_PAD, pad) == 1


def _libc_name() -> str:
    """"glibc" under glibc, else "": what ``platform.libc_ver()[0]`` reads first (from
    ``confstr``), without importing :mod:`platform` (a millisecond of ``import qseries``;
    the command line's typer imports it all the same)."""
    try:
        name = os.confstr("CS_GNU_LIBC_VERSION")
    except (AttributeError, ValueError, OSError):
        return ""
    return name.split()[0] if name else ""
