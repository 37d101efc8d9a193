"""Where the batches of a scan run: in this process, in a pool of local worker processes,
or on a Dask distributed cluster.  The scan drives all three the same way (submit a batch,
wait for any to finish, take its outcomes), so the code the tests run in-process is the
code that runs on a cluster.

A batch is a pure function call (:func:`qseries.discovery.examine.examine_batch`): running
it twice gives the same outcomes, so the cluster may retry the batches of a worker it lost
(Dask does, on another worker).  A batch that cannot be run (a local worker process that
died, a batch that killed several Dask workers, a worker without qseries) comes back as
:class:`BatchLost`, and its members are listed as failed.

>>> from qseries.discovery.examine import Criteria, ScanJob
>>> from qseries.discovery.family import Family
>>> job = ScanJob(Family("1/(q^$a;q^$a)_inf", (("a", "1..2"),)), Criteria(order=20))
>>> with InlineEngine() as engine:
...     f = engine.submit(job, ((0, (("a", 1),)),))
...     [o.status for o in engine.result(f)]
['hit']
"""

from __future__ import annotations

import gc
import hashlib
import logging
import re
import sys
from abc import ABC, abstractmethod
from collections.abc import Iterable
from concurrent.futures import FIRST_COMPLETED, Future
from concurrent.futures import wait as wait_futures
from typing import Any

from ..catalogue.verify import _interrupts_held, _start_pool, _stop_pool, available_cores
from ..errors import QSeriesError
from .examine import MemberOutcome, ScanJob, examine_batch
from .family import Params

Batch = tuple[tuple[int, Params], ...]

#: a scheduler address: [SCHEME://]HOST:PORT, over a network transport of dask.distributed
_ADDRESS = re.compile(r"^(?:(?:tcp|tls|ws|wss|ucx)://)?(?:\[[0-9A-Fa-f:.]+\]|[^\s:/\[\]]+)"
                      r":(\d{1,5})$")
#: the address of a cluster in this process (a LocalCluster with processes=False)
_INPROC = re.compile(r"^inproc://\S+$")

__all__ = ["BatchLost", "DaskEngine", "Engine", "EngineLost", "InlineEngine", "PoolEngine",
           "batch_key", "check_address"]


class BatchLost(Exception):
    """A batch that could not be run; ``reason`` says why, ``retry`` whether the scan should
    submit it again (a local worker process that died; Dask retries by itself).

    >>> BatchLost("worker died").reason
    'worker died'
    """

    def __init__(self, reason: str, retry: bool = False) -> None:
        super().__init__(reason)
        self.reason = reason
        self.retry = retry


class EngineLost(QSeriesError):
    """The engine can run nothing more (the Dask scheduler went away, or the client was
    closed): the scan stops, and the members not finished are not failed but left for
    ``--resume``.

    >>> str(EngineLost("lost the Dask cluster"))
    'lost the Dask cluster'
    """


def _lost(err: BaseException) -> EngineLost:
    """EngineLost for Dask's ``err``: its ``Message:`` line when it has one (Dask lists
    every future cancelled after it), else its first line."""
    lines = [line.strip() for line in str(err).splitlines() if line.strip()]
    said = next((line.removeprefix("Message:").strip() for line in lines
                 if line.startswith("Message:")), lines[0] if lines else "")
    return EngineLost(f"lost the Dask cluster ({type(err).__name__}: {said})")


def batch_key(job: ScanJob, batch: Batch) -> str:
    """A name for a batch that depends only on what it computes (Dask's task key: the
    same batch submitted twice is one task).

    >>> from qseries.discovery.examine import Criteria
    >>> from qseries.discovery.family import Family
    >>> job = ScanJob(Family("$a", (("a", "1..2"),)), Criteria(order=20))
    >>> batch_key(job, ((0, (("a", 1),)),)) == batch_key(job, ((0, (("a", 1),)),))
    True
    """
    digest = hashlib.sha256(repr((job, batch)).encode("utf-8")).hexdigest()[:24]
    return f"qseries-scan-{batch[0][0] if batch else 0}-{digest}"


def check_address(address: str) -> str:
    """``address`` if it is a scheduler address ``[SCHEME://]HOST:PORT`` (scheme tcp, tls,
    ws, wss or ucx; tcp when none is given) or the ``inproc://`` address of a cluster in
    this process, else a QSeriesError: checked before Dask sees it, since Dask's own
    refusal is a ValueError from inside its connection code.

    >>> check_address("tcp://10.0.0.5:8786")
    'tcp://10.0.0.5:8786'
    >>> check_address("10.0.0.5")  # doctest: +ELLIPSIS
    Traceback (most recent call last):
    ...
    qseries.errors.QSeriesError: '10.0.0.5' is not a Dask scheduler address: write ...
    """
    if _INPROC.match(address):
        return address
    match = _ADDRESS.match(address)
    if match is None or not 0 < int(match.group(1)) < 65536:
        raise QSeriesError(f"{address!r} is not a Dask scheduler address: write "
                           f"[SCHEME://]HOST:PORT, such as tcp://host:8786 (scheme tcp, tls, "
                           f"ws, wss or ucx)")
    return address


class Engine(ABC):
    """The interface: ``workers`` (parallel slots), :meth:`submit`, :meth:`wait_any`,
    :meth:`result`, :meth:`close`; a context manager (closing aborts on an exception).

    >>> sorted(Engine.__abstractmethods__)
    ['result', 'submit', 'wait_any']
    """

    workers: int = 1

    @abstractmethod
    def submit(self, job: ScanJob, batch: Batch) -> Any:
        """Start a batch; a handle to wait for."""

    @abstractmethod
    def wait_any(self, pending: Iterable[Any]) -> set[Any]:
        """Block until at least one of ``pending`` is finished; the finished ones."""

    @abstractmethod
    def result(self, handle: Any) -> list[MemberOutcome]:
        """The outcomes of a finished batch, or :class:`BatchLost`."""

    def close(self, abort: bool = False) -> None:  # noqa: B027 - nothing to release here
        """Release the workers (``abort``: cancel what is still queued and stop now)."""

    def __enter__(self) -> Engine:
        return self

    def __exit__(self, kind: object, *rest: object) -> None:
        self.close(abort=kind is not None)


class InlineEngine(Engine):
    """Runs each batch in this process when it is submitted (one worker).

    >>> InlineEngine().workers
    1
    """

    workers = 1

    def submit(self, job: ScanJob, batch: Batch) -> Future:
        future: Future = Future()
        future.set_result(examine_batch(job, batch))
        return future

    def wait_any(self, pending: Iterable[Future]) -> set[Future]:
        return set(wait_futures(list(pending), return_when=FIRST_COMPLETED).done)

    def result(self, handle: Future) -> list[MemberOutcome]:
        return handle.result()


class PoolEngine(InlineEngine):
    """Local worker processes (default: one per core); Ctrl-C reaches only this process,
    which stops the workers (as ``verify`` does).

    >>> with PoolEngine(1) as engine:
    ...     engine.workers
    1
    """

    def __init__(self, jobs: int | None = None) -> None:
        cores = available_cores()
        self.workers = max(1, min(cores if jobs is None else jobs, cores))
        self.pool = _start_pool(self.workers)

    def submit(self, job: ScanJob, batch: Batch) -> Future:
        from concurrent.futures.process import BrokenProcessPool

        with _interrupts_held():           # workers start with Ctrl-C ignored
            try:
                return self.pool.submit(examine_batch, job, batch)
            except BrokenProcessPool:
                self._replace()
                return self.pool.submit(examine_batch, job, batch)

    def _replace(self) -> None:
        """A worker died, which breaks the whole pool: a fresh one takes its place (the
        batches the old one held come back as :class:`BatchLost` to be submitted again)."""
        if getattr(self.pool, "_broken", False):
            _stop_pool(self.pool)
            self.pool = _start_pool(self.workers)

    def result(self, handle: Future) -> list[MemberOutcome]:
        from concurrent.futures.process import BrokenProcessPool

        try:
            return handle.result()
        except BrokenProcessPool:
            self._replace()
            raise BatchLost("a worker process ended abruptly (out of memory, or a crash in "
                            "the member's evaluation)", retry=True) from None

    def close(self, abort: bool = False) -> None:
        if abort:
            _stop_pool(self.pool)
        else:
            self.pool.shutdown(wait=True)


def _connect(distributed: Any, address: str, timeout: float) -> Any:
    """A client of the scheduler at ``address``, or a QSeriesError saying why not."""
    try:
        return distributed.Client(address, timeout=timeout, set_as_default=False)
    except (OSError, TimeoutError) as err:
        failure: BaseException = err
        message = f"cannot reach the Dask scheduler at {address}: {err}"
    except (ValueError, TypeError) as err:       # a TLS address without TLS settings
        failure = err
        message = f"cannot connect to the Dask scheduler at {address}: {err}"
    # the half-made client, held by the failure's traceback, complains from its __del__
    # when it cannot close: let it go now, its complaint not printed
    hook = sys.unraisablehook
    sys.unraisablehook = lambda _unraisable: None
    try:
        del failure
        gc.collect()
    finally:
        sys.unraisablehook = hook
    raise QSeriesError(message)


class DaskEngine(Engine):
    """A Dask distributed cluster: the scheduler at ``address`` (``tcp://host:8786``), or
    an existing ``client`` (which is left open).  Needs the extra ``cluster``
    (``pip install 'qseries[cluster]'``) here and qseries on every worker.

    >>> DaskEngine()  # doctest: +ELLIPSIS
    Traceback (most recent call last):
    ...
    qseries.errors.QSeriesError: give the scheduler's address, such as tcp://host:8786
    """

    def __init__(self, address: str | None = None, client: Any = None,
                 timeout: float = 30) -> None:
        try:
            import distributed
        except ImportError:
            raise QSeriesError("--cluster needs dask.distributed: pip install "
                               "'qseries[cluster]'") from None
        self._distributed = distributed
        self.own = client is None
        if client is None:
            if not address:
                raise QSeriesError("give the scheduler's address, such as tcp://host:8786")
            client = _connect(distributed, check_address(address), timeout)
        self.client = client
        self.workers = max(1, sum(client.nthreads().values()))
        self.futures: set[Any] = set()

    def submit(self, job: ScanJob, batch: Batch) -> Any:
        try:
            future = self.client.submit(examine_batch, job, batch, key=batch_key(job, batch),
                                        pure=True)
        except Exception as err:   # noqa: BLE001 - a closed client, a scheduler gone
            raise _lost(err) from None
        self.futures.add(future)
        return future

    def wait_any(self, pending: Iterable[Any]) -> set[Any]:
        try:
            with self.client.as_current():       # our client, not the process's default
                done = self._distributed.wait(list(pending),
                                              return_when="FIRST_COMPLETED").done
        except Exception as err:   # noqa: BLE001 - futures cancelled: the scheduler is gone
            raise _lost(err) from None
        return set(done)

    def result(self, handle: Any) -> list[MemberOutcome]:
        from concurrent.futures import CancelledError

        self.futures.discard(handle)
        try:
            out = handle.result()
        except CancelledError as err:      # the scheduler went away, not the batch's doing
            raise _lost(err) from None
        except Exception as err:     # noqa: BLE001 - KilledWorker, a worker without qseries
            name = type(err).__name__
            raise BatchLost(f"the cluster could not run this batch ({name}: {err})") from None
        finally:
            try:
                handle.release()
            except Exception:  # noqa: BLE001 - the client may be closed already
                pass
        return out

    def close(self, abort: bool = False) -> None:
        if abort and self.futures:
            try:
                self.client.cancel(list(self.futures))
            except Exception:  # noqa: BLE001 - the cluster may be gone already
                pass
        self.futures.clear()
        if self.own:
            # a client whose scheduler is gone logs its reconnection, cancelled by close,
            # as an error with a traceback: not news to the user, who is told it is gone
            logger = logging.getLogger("distributed.client")
            level = logger.level
            if abort:
                logger.setLevel(logging.CRITICAL)
            try:
                self.client.close()
            except Exception:  # noqa: BLE001 - a scheduler gone cannot be told goodbye
                pass
            finally:
                logger.setLevel(level)
