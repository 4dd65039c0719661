"""Run a study's variants on the local cores or on a Dask cluster, keeping each finished row.

:class:`StudyRunner` is the one place variants are flown: every stage (sweep, optimisation,
uncertainty, sensitivity) hands it lists of settings and gets rows back in the same order. A
variant already in the results table (same identity hash) is not flown again, so an interrupted
study resumes where it stopped, and the optimiser never flies a point twice.
"""

from __future__ import annotations

import json
import math
import os
import time
from collections.abc import Callable, Sequence
from concurrent.futures import FIRST_COMPLETED, ProcessPoolExecutor, wait
from pathlib import Path

from sim.analysis.study.design import variant_id
from sim.analysis.study.evaluate import TIMING_KEY, Job, evaluate
from sim.analysis.study.store import StudyStore
from sim.io.study_schema import ConstraintSpec

__all__ = ["StudyRunner", "judge"]


def judge(row: dict, constraints: Sequence[ConstraintSpec], columns: Sequence[str]) -> dict:
    """Add the constraint verdicts (``verdicts``: column -> 1.0 met, 0.0 not, NaN unknown) and
    ``feasible`` (flew, in trim when the mass model says so, every constraint met) to a row."""
    outs = row.get("outputs", {})
    verdicts = {}
    for c, col in zip(constraints, columns, strict=True):
        x = outs.get(c.output, math.nan)
        if not row.get("ok") or x is None or math.isnan(x):
            verdicts[col] = math.nan
            continue
        met = (c.min is None or x >= c.min) and (c.max is None or x <= c.max)
        verdicts[col] = 1.0 if met else 0.0
    row["verdicts"] = verdicts
    trim = outs.get("in_trim", 1.0)
    row["feasible"] = int(
        bool(row.get("ok")) and trim == 1.0 and all(v == 1.0 for v in verdicts.values())
    )
    return row


class StudyRunner:
    """Flies variants for a study and keeps their rows.

    Parameters
    ----------
    scenario_path, vessel_path : path
        The base scenario and the vessel flown (None: the scenario's).
    store : StudyStore
        Where rows go (and where finished ones are found).
    constraints : sequence of ConstraintSpec
        The study's constraints (verdict columns ``meets:<i>``).
    constraint_columns : sequence of str
        Column name of each constraint's verdict.
    mass : dict or None
        The [mass] table (None: no mass model).
    sample_s : float or None
        Sampling interval of each run [s].
    jobs : int, optional
        Local worker processes (default one per core); 1 flies in this process.
    cluster : str, optional
        Address of a Dask distributed scheduler ("tcp://host:8786"), or a
        ``distributed.Client`` (tests pass one of a LocalCluster).
    progress : callable, optional
        Called with (done, total, row) as each variant of a batch finishes.
    """

    def __init__(
        self,
        scenario_path: str | Path,
        vessel_path: str | Path | None,
        store: StudyStore,
        constraints: Sequence[ConstraintSpec],
        constraint_columns: Sequence[str],
        *,
        mass: dict | None = None,
        sample_s: float | None = None,
        jobs: int | None = None,
        cluster=None,
        progress: Callable[[int, int, dict], None] | None = None,
    ) -> None:
        self.scenario_path = str(scenario_path)
        self.vessel_path = None if vessel_path is None else str(vessel_path)
        self.store = store
        self.constraints = list(constraints)
        self.constraint_columns = list(constraint_columns)
        self.mass = mass
        self.sample_s = sample_s
        self.jobs = max(1, int(jobs if jobs is not None else (os.cpu_count() or 1)))
        self.cluster = cluster
        self.progress = progress
        self._pool = None
        self._client = None
        self._own_client = False
        self.flown = 0
        """Variants actually flown by this runner (not found in the table)."""
        self.timing = {"load_s": 0.0, "fly_s": 0.0, "write_s": 0.0}
        """Seconds summed over the variants flown: loading them (the mass model included) and
        flying them (in the workers), and keeping their rows (in this process)."""
        for row in store.rows.values():  # the constraints may have changed since they flew
            judge(row, self.constraints, self.constraint_columns)

    # -------------------------------------------------------------- executors

    def __enter__(self):
        return self

    def __exit__(self, *exc):
        self.close()

    def close(self) -> None:
        if self._pool is not None:
            self._pool.shutdown(wait=True, cancel_futures=True)
            self._pool = None
        if self._client is not None and self._own_client:
            self._client.close()
        self._client = None

    def _dask(self):
        if self._client is None:
            if isinstance(self.cluster, str):
                from distributed import Client

                self._client = Client(self.cluster)
                self._own_client = True
            else:
                self._client = self.cluster
        return self._client

    def _local(self):
        if self._pool is None:
            self._pool = ProcessPoolExecutor(max_workers=self.jobs)
        return self._pool

    # -------------------------------------------------------------- flying

    def job(self, settings) -> Job:
        settings = tuple(settings)
        # the identity covers what else shapes the run: the sampling and the mass model
        ident = (*settings, ("@sample_s", self.sample_s), ("@mass", json.dumps(self.mass)))
        return Job(
            variant_id(ident),
            self.scenario_path,
            self.vessel_path,
            settings,
            self.sample_s,
            self.mass,
        )

    def run(self, batch: Sequence[Sequence[tuple[str, object]]], stage: str) -> list[dict]:
        """Rows of the variants in ``batch`` (in its order), flying those not yet in the table."""
        jobs = [self.job(s) for s in batch]
        todo: dict[str, Job] = {}
        for j in jobs:
            if j.variant_id not in self.store and j.variant_id not in todo:
                todo[j.variant_id] = j
        total, done = len(todo), 0

        def finish(results: Sequence[tuple[dict, Job]]) -> None:
            """Keep rows that came back (one journal write for them all), then report each."""
            nonlocal done
            t0 = time.perf_counter()
            for row, job in results:
                for k, v in (row.pop(TIMING_KEY, None) or {}).items():
                    self.timing[k] += v
                row["stage"] = stage
                row["inputs"] = [list(kv) for kv in job.settings]
                judge(row, self.constraints, self.constraint_columns)
            self.store.add_many([row for row, _job in results])
            self.timing["write_s"] += time.perf_counter() - t0
            for row, _job in results:
                self.flown += 1
                done += 1
                if self.progress:
                    self.progress(done, total, row)

        pending = list(todo.values())
        if pending and self.cluster is not None:
            client = self._dask()
            from distributed import as_completed as dask_completed

            futures = client.map(
                evaluate, pending, key=[f"variant-{j.variant_id}" for j in pending]
            )
            by_key = {f.key: j for f, j in zip(futures, pending, strict=True)}
            for fut in dask_completed(futures):
                finish([(fut.result(), by_key[fut.key])])
        elif pending and (self.jobs == 1 or len(pending) == 1):
            for j in pending:
                finish([(evaluate(j), j)])
        elif pending:
            pool = self._local()
            futures = {pool.submit(evaluate, j): (i, j) for i, j in enumerate(pending)}
            waiting = set(futures)
            while waiting:
                # every row that has come back is kept at once, in one journal write
                ready, waiting = wait(waiting, return_when=FIRST_COMPLETED)
                ready = sorted(ready, key=lambda f: futures[f][0])
                good = [(f.result(), futures[f][1]) for f in ready if f.exception() is None]
                finish(good)
                for f in ready:
                    f.result()  # a worker that died: raised once the others are kept
        return [self.store.get(j.variant_id) for j in jobs]
