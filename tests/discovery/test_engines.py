"""The engines: in this process, local worker processes, and a Dask LocalCluster with two
workers started inside the test (the same hits; a worker killed mid-scan changes
nothing)."""

import os
import signal

import pytest

from qseries.discovery import (
    BatchLost,
    Criteria,
    DaskEngine,
    Family,
    InlineEngine,
    PoolEngine,
    ScanStopped,
    run_scan,
)
from qseries.discovery.engines import batch_key
from qseries.discovery.examine import ScanJob
from qseries.errors import QSeriesError

distributed = pytest.importorskip("distributed")

# 16 members, among them Rogers' three mod 14 identities (L. J. Slater, Proc. London Math.
# Soc. (2) 54 (1952), entries 59-61, numbers from memory; the products are checked against
# the published ones in test_scan.py)
FAMILY = Family("sum_{n>=0} q^(n^2+$b n)/((q;q)_n (q;q^2)_(n+$c))",
                (("b", "-3..4"), ("c", "0..1")))
CRITERIA = Criteria(order=300)


@pytest.fixture(scope="module")
def inline():
    return run_scan(FAMILY, CRITERIA, engine=InlineEngine())


def _hits(report):
    return {g.representative.params: g.representative.product for g in report.groups}


def _cluster(processes):
    # dashboard_address=None still serves the dashboard on port 8787 (a clash with any other
    # cluster on the machine); ":0" lets the system choose a free port
    return distributed.LocalCluster(n_workers=2, threads_per_worker=1, processes=processes,
                                    dashboard_address=":0", silence_logs=50)


def test_the_family_has_the_three_mod_14_hits(inline):
    assert set(_hits(inline)) == {(("b", 0), ("c", 0)), (("b", 1), ("c", 1)),
                                  (("b", 2), ("c", 1))}


def test_a_pool_of_two_processes_gives_the_same_outcomes(inline):
    with PoolEngine(2) as engine:
        assert engine.workers <= 2
        report = run_scan(FAMILY, CRITERIA, engine=engine, batch_size=3)
    assert report.outcomes == inline.outcomes


def test_a_two_worker_local_cluster_gives_the_same_hits(inline):
    with _cluster(processes=False) as cluster, distributed.Client(cluster) as client:
        engine = DaskEngine(client=client)
        assert engine.workers == 2
        seen = []
        report = run_scan(FAMILY, CRITERIA, engine=engine, batch_size=2,
                          progress=lambda got, done, total: seen.append(done))
        engine.close()
    assert report.outcomes == inline.outcomes
    assert _hits(report) == _hits(inline)
    # the results streamed back batch by batch
    assert seen == sorted(seen) and len(seen) == 8 and seen[-1] == 16


def test_killing_a_worker_mid_scan_gives_the_same_hits(inline):
    killed = []
    with _cluster(processes=True) as cluster, distributed.Client(cluster) as client:
        engine = DaskEngine(client=client)
        pids = client.run(os.getpid)

        def kill_one(got, done, total):
            if killed:
                return
            busy = [w for w, keys in client.processing().items() if keys]
            if busy and done < total:
                os.kill(pids[busy[0]], signal.SIGKILL)
                killed.append(busy[0])

        report = run_scan(FAMILY, CRITERIA, engine=engine, batch_size=2, progress=kill_one)
        engine.close()
        log = client.run_on_scheduler(lambda dask_scheduler: [
            (t[0], t[2]) for t in dask_scheduler.transition_log])
    assert killed, "no worker was busy after the first batch came back"
    # the batches the killed worker held were run again elsewhere
    started = [key for key, state in log if state == "processing"]
    assert len(started) > len(set(started))
    assert report.outcomes == inline.outcomes        # nothing lost, failed or doubled
    assert not report.of("failed")
    assert _hits(report) == _hits(inline)


def test_batches_are_named_by_their_content():
    job = ScanJob(FAMILY, CRITERIA)
    a = batch_key(job, ((0, (("b", -3), ("c", 0))),))
    assert a == batch_key(ScanJob(FAMILY, Criteria(order=300)), ((0, (("b", -3), ("c", 0))),))
    assert a != batch_key(ScanJob(FAMILY, Criteria(order=301)), ((0, (("b", -3), ("c", 0))),))


def test_a_batch_the_cluster_cannot_run_is_lost_not_fatal():
    with _cluster(processes=False) as cluster, distributed.Client(cluster) as client:
        engine = DaskEngine(client=client)
        future = client.submit(lambda: 1 / 0, pure=False)
        with pytest.raises(BatchLost, match="ZeroDivisionError"):
            engine.result(future)
        engine.close()


@pytest.mark.parametrize("address", ["nonsense", "tcp://localhost", "foo://x:8786",
                                     "tcp://localhost:99999", "tcp://localhost:abc",
                                     "tcp://localhost:8786/x", "tcp://localhost:0"])
def test_a_malformed_scheduler_address_is_a_clear_error(address):
    # found by a trial: --cluster nonsense ended in dask's ValueError, with a traceback
    with pytest.raises(QSeriesError, match="not a Dask scheduler address"):
        DaskEngine(address, timeout=1)


def test_an_unreachable_scheduler_is_a_clear_error():
    with pytest.raises(QSeriesError, match="cannot reach the Dask scheduler"):
        DaskEngine("tcp://127.0.0.1:9", timeout=1)


def _crashing(marker_dir, crash_once, crash_always):
    """examine_member, except that the worker process dies at some members (the test's
    pool is forked, so its workers run this replacement)."""
    import qseries.discovery.examine as examine_module
    real = examine_module.examine_member

    def member(job, index, params):
        marker = marker_dir / f"crashed-{index}"
        if index in crash_always or (index in crash_once and not marker.exists()):
            marker.touch()
            os._exit(1)
        return real(job, index, params)

    return member


@pytest.mark.skipif(__import__("multiprocessing").get_start_method() != "fork",
                    reason="the replacement reaches the workers only in forked processes")
def test_a_local_worker_that_dies_is_replaced_and_its_batches_retried(inline, tmp_path,
                                                                       monkeypatch):
    import qseries.discovery.examine as examine_module
    monkeypatch.setattr(examine_module, "examine_member",
                        _crashing(tmp_path, crash_once={2, 9}, crash_always={5}))
    with PoolEngine(2) as engine:
        report = run_scan(FAMILY, CRITERIA, engine=engine, batch_size=3)
    # members 2 and 9 crashed their workers once and were computed on the retry; member 5
    # crashes every time: it fails alone (the members of a lost batch run again one at a
    # time, with nothing else in flight)
    assert (tmp_path / "crashed-2").exists() and (tmp_path / "crashed-9").exists()
    [failed] = report.of("failed")
    assert failed.index == 5 and "ended abruptly" in failed.reason
    assert [o for o in report.outcomes if o.index != 5] == \
        [o for o in inline.outcomes if o.index != 5]


def test_without_dask_cluster_is_a_clear_error(monkeypatch):
    import sys
    monkeypatch.setitem(sys.modules, "distributed", None)
    with pytest.raises(QSeriesError, match=r"qseries\[cluster\]"):
        DaskEngine("tcp://127.0.0.1:8786")


def test_a_cluster_that_goes_away_stops_the_scan_with_what_finished(inline):
    # found by a trial: with the scheduler gone, the scan ended in Dask's
    # FuturesCancelledError (a traceback), or would have listed the members not yet run as
    # failed, so that --resume never ran them
    cluster = _cluster(processes=False)
    with distributed.Client(cluster) as client:
        engine = DaskEngine(client=client)

        def close_after_the_first_batches(got, done, total):
            if done >= 4:
                cluster.close()

        with pytest.raises(ScanStopped, match="Dask cluster") as stop:
            run_scan(FAMILY, CRITERIA, engine=engine, batch_size=2,
                     progress=close_after_the_first_batches)
        engine.close(abort=True)
    finished = stop.value.report.outcomes
    assert 4 <= len(finished) < 16
    assert list(finished) == [o for o in inline.outcomes if o.index in
                              {f.index for f in finished}]     # none failed

