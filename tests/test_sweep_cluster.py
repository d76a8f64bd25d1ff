"""Sweeps on dask: a LocalCluster of two worker processes on 127.0.0.1, started here.

The same sweep run serially, on the cluster by its address, and with a worker killed in
the middle of the run must give the same table (to 1e-12), every sample exactly once.
One cluster serves the module (start-up dominates the time).
"""

from __future__ import annotations

import os
import signal
import tomllib

import numpy as np
import pytest

from seatool.analysis import sweep_run
from seatool.analysis.sweep import Parameter, SweepSpec, sweep
from seatool.errors import InputError

distributed = pytest.importorskip("distributed")

ONE = """
[bands]
lowest = 500
highest = 1000
[subsystems.room]
kind = "cavity"
dimensions = [4.0, 3.0, 2.5]
damping = 0.01
[excitations.src]
subsystem = "room"
power = 1e-3
"""

SPEC = SweepSpec(
    (
        Parameter("subsystems.room.damping", 0.005, 0.05, scale="log"),
        Parameter("subsystems.room.dimensions", 0.8, 1.25),  # a factor on the three lengths
    ),
    "sobol",
    16,
    seed=5,
)


@pytest.fixture(scope="module")
def cluster():
    with distributed.LocalCluster(
        n_workers=2,
        threads_per_worker=1,
        processes=True,
        host="127.0.0.1",
        dashboard_address="127.0.0.1:0",  # loopback, any free port (no fixed 8787)
        death_timeout=60,
    ) as c, distributed.Client(c, timeout=60) as client:
        yield c, client


@pytest.fixture(scope="module")
def serial():
    return sweep(tomllib.loads(ONE), SPEC, scheduler="serial")


def test_address_gives_the_serial_table(cluster, serial):
    c, _ = cluster
    s = sweep(tomllib.loads(ONE), SPEC, scheduler=c.scheduler_address, batch=3)
    assert s.design.columns == ("subsystems.room.damping", "subsystems.room.dimensions:factor")
    np.testing.assert_array_equal(s.design.values, serial.design.values)
    np.testing.assert_allclose(s.levels, serial.levels, rtol=0, atol=1e-12)
    t = s.table()
    assert list(t["sample"]) == list(range(16))


def test_killed_worker_loses_and_duplicates_nothing(cluster, serial):
    c, client = cluster
    killed: list[int] = []

    def kill_one(done: int, total: int) -> None:
        if killed:
            return
        busy = [w for w, keys in client.processing().items() if keys]
        pids = client.run(os.getpid, workers=busy[:1])
        for pid in pids.values():
            os.kill(pid, signal.SIGKILL)
            killed.append(pid)

    s = sweep(tomllib.loads(ONE), SPEC, scheduler=client, batch=1, on_batch=kill_one)
    assert len(killed) == 1  # a worker with work in hand was killed after the first batch
    np.testing.assert_allclose(s.levels, serial.levels, rtol=0, atol=1e-12)
    t = s.table()
    assert list(t["sample"]) == list(range(16))
    assert not t.duplicated(subset=list(s.design.columns)).any()
    client.wait_for_workers(2, timeout=60)  # the nanny restarts it


def test_local_default_starts_and_stops_its_own_cluster(serial):
    # scheduler="local" (the default): a LocalCluster of this machine's processes
    s = sweep(tomllib.loads(ONE), SPEC, workers=1, batch=8)
    np.testing.assert_allclose(s.levels, serial.levels, rtol=0, atol=1e-12)


def test_unreachable_scheduler_is_bad_input(monkeypatch):
    monkeypatch.setattr(sweep_run, "CONNECT_TIMEOUT", 1.0)
    with pytest.raises(InputError, match="cannot reach a dask scheduler"):
        sweep(tomllib.loads(ONE), SPEC, scheduler="tcp://127.0.0.1:9", batch=8)
