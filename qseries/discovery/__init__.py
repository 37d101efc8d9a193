"""Discovery: scan families of sums for product forms (or for equality with a given right
side), in this process, in local worker processes or on a Dask cluster.

:mod:`.family` (template, ranges, constraints), :mod:`.examine` (the filter and the
confirmation of one member; a batch is a pure function), :mod:`.grouping` (trivially
related hits), :mod:`.engines` (inline, process pool, Dask), :mod:`.record` (the progress
record a scan resumes from), :mod:`.scan` (the driver and the identity file of the hits).

>>> family = Family("sum_{n>=0} q^(n^2+$b n)/(q;q)_n", (("b", "0..1"),))
>>> [g.representative.product for g in run_scan(family, Criteria(order=60), jobs=1).groups]
['(q, q^4;q^5)_inf^-1', '(q^2, q^3;q^5)_inf^-1']
"""

from .engines import BatchLost, DaskEngine, Engine, EngineLost, InlineEngine, PoolEngine
from .examine import Criteria, MemberOutcome, ScanJob, examine_batch, examine_member
from .family import MAX_SCAN_MEMBERS, Family, parse_param
from .grouping import Group, Relation, group_hits, minus_q
from .record import ScanRecord, progress_path
from .scan import (
    ScanInterrupted,
    ScanReport,
    ScanStopped,
    hits_file_text,
    record_header,
    run_scan,
)

__all__ = ["MAX_SCAN_MEMBERS", "BatchLost", "Criteria", "DaskEngine", "Engine", "EngineLost",
           "Family", "Group", "InlineEngine", "MemberOutcome", "PoolEngine", "Relation",
           "ScanInterrupted", "ScanJob", "ScanRecord", "ScanReport", "ScanStopped",
           "examine_batch", "examine_member",
           "group_hits", "hits_file_text", "minus_q", "parse_param", "progress_path",
           "record_header", "run_scan"]
