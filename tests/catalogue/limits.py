"""Guards for tests of inputs that used to hang or exhaust memory: a failing test must end
with an error, not take the machine with it."""

from __future__ import annotations

import contextlib
import resource
import signal
from collections.abc import Iterator


class TookTooLong(Exception):
    """Raised in the main thread when a ``deadline`` passes."""


@contextlib.contextmanager
def deadline(seconds: float) -> Iterator[None]:
    """Raise TookTooLong in the block after ``seconds`` of wall time (main thread only); a
    blocked system call such as opening a FIFO is interrupted too."""
    def alarm(_signum, _frame):
        raise TookTooLong(f"still running after {seconds} s")

    old = signal.signal(signal.SIGALRM, alarm)
    signal.setitimer(signal.ITIMER_REAL, seconds)
    try:
        yield
    finally:
        signal.setitimer(signal.ITIMER_REAL, 0)
        signal.signal(signal.SIGALRM, old)


def _address_space() -> int:
    with open("/proc/self/status") as f:
        for line in f:
            if line.startswith("VmSize:"):
                return int(line.split()[1]) * 1024
    return 0


@contextlib.contextmanager
def memory_cap(extra_bytes: int = 1 << 30) -> Iterator[None]:
    """Let the block grow the address space by at most ``extra_bytes``; beyond, the block
    fails with an AssertionError once the memory it held is freed.  Put it innermost: code
    that runs while the MemoryError is in flight may itself fail to allocate."""
    soft, hard = resource.getrlimit(resource.RLIMIT_AS)
    limit = _address_space() + extra_bytes
    if hard != resource.RLIM_INFINITY:
        limit = min(limit, hard)
    resource.setrlimit(resource.RLIMIT_AS, (limit, hard))
    exhausted = False
    try:
        yield
    except MemoryError:
        exhausted = True       # leaving this clause drops the traceback and its frames
    finally:
        resource.setrlimit(resource.RLIMIT_AS, (soft, hard))
    if exhausted:
        raise AssertionError(f"used more than {extra_bytes} bytes")
