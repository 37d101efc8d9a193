"""keep_heap_pad: on Linux with glibc the backend's import keeps a pad at the top of the
heap, so that repeated large FLINT allocations stop faulting their pages in (counted by the
kernel: ru_minflt, in fresh processes with and without the backend imported)."""

import os
import platform
import subprocess
import sys

import pytest

from qseries.backend import allocator

GLIBC = sys.platform.startswith("linux") and platform.libc_ver()[0] == "glibc"

#: allocate and free 300 polynomials of 60 000 words (the shape of a nested sum's levels)
#: and print the minor page faults this took
LOOP = """
import resource, sys, flint
if sys.argv[1] == "backend":
    import qseries.backend
p = flint.nmod_poly(list(range(60000)), 1000003)
r0 = resource.getrusage(resource.RUSAGE_SELF).ru_minflt
for _ in range(300):
    p = (p + p.left_shift(1)).truncate(60000)
print(resource.getrusage(resource.RUSAGE_SELF).ru_minflt - r0)
"""


def _faults(mode: str) -> int:
    root = os.path.dirname(os.path.dirname(os.path.dirname(os.path.abspath(__file__))))
    env = {**os.environ, "PYTHONPATH": root}
    for name in ("MALLOC_TOP_PAD_", "MALLOC_TRIM_THRESHOLD_", "MALLOC_MMAP_THRESHOLD_"):
        env.pop(name, None)
    out = subprocess.run([sys.executable, "-c", LOOP, mode], capture_output=True, text=True,
                         env=env, check=True, timeout=120)
    return int(out.stdout.strip())


@pytest.mark.skipif(not GLIBC, reason="the pad is a glibc setting")
def test_the_pad_stops_the_page_faults():
    without, with_pad = _faults("flint"), _faults("backend")
    # without the pad every freed block is given back and faulted in again (hundreds of
    # thousands of faults); with it the blocks are reused
    assert with_pad * 10 < without, (with_pad, without)


def test_keep_heap_pad_says_whether_it_applied():
    assert allocator.keep_heap_pad() is GLIBC


def test_the_libc_is_named_as_the_platform_module_names_it():
    # the allocator reads confstr itself rather than import platform at every start-up
    assert (allocator._libc_name() == "glibc") is (platform.libc_ver()[0] == "glibc")
