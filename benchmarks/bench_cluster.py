"""Catalogue builds: parts per second for --jobs 1, --jobs 2 and Dask with 2 local workers.

A 200-part series of 2 mm pulleys (STL only) is built three times into fresh folders; the
Dask route runs on a scheduler and two workers started here on loopback. Prints parts/s and
the Dask overhead per part against --jobs 2 (same number of processes). Run from the
repository root: ``python benchmarks/bench_cluster.py``.
"""

from __future__ import annotations

import os
import socket
import subprocess
import sys
import tempfile
import time

from gen.cli import main

CATALOGUE = """
series:
  catalogue:
    kind: timing_pulley
    name: "cat_{belt_width}_{teeth}t"
    vary: {belt_width: [6, 9], teeth: "12..111"}
    values: {profile: curv2, flanges: none, chord_tolerance: 0.05}
"""
N = 200


def _timed(args) -> float:
    t0 = time.perf_counter()
    assert main(args) == 0
    return time.perf_counter() - t0


def _cluster():
    with socket.socket() as s:
        s.bind(("127.0.0.1", 0))
        port = s.getsockname()[1]
    dask = os.path.join(os.path.dirname(sys.executable), "dask")
    quiet = dict(stdout=subprocess.DEVNULL, stderr=subprocess.DEVNULL)
    procs = [subprocess.Popen([dask, "scheduler", "--host", "127.0.0.1", "--port", str(port),
                               "--no-dashboard"], **quiet)]
    address = f"tcp://127.0.0.1:{port}"
    procs += [subprocess.Popen([dask, "worker", address, "--nthreads", "1", "--host",
                                "127.0.0.1", "--no-dashboard"], **quiet) for _ in range(2)]
    from distributed import Client

    with Client(address, timeout="60s") as c:
        c.wait_for_workers(2, timeout=120)
    return address, procs


def main_bench():
    with tempfile.TemporaryDirectory() as tmp:
        path = os.path.join(tmp, "catalogue.yaml")
        with open(path, "w") as fh:
            fh.write(CATALOGUE)
        base = ["build", path, "--format", "stl"]
        t1 = _timed(base + ["--out", os.path.join(tmp, "j1")])
        t2 = _timed(base + ["--out", os.path.join(tmp, "j2"), "--jobs", "2"])
        address, procs = _cluster()
        try:
            td = _timed(base + ["--out", os.path.join(tmp, "dask"), "--executor", "dask",
                                "--scheduler", address])
        finally:
            for p in procs:
                p.kill()
    print(f"{N} parts, STL only")
    for label, t in (("--jobs 1", t1), ("--jobs 2", t2), ("dask, 2 workers", td)):
        print(f"  {label:<16} {t:7.1f} s   {N / t:6.1f} parts/s")
    print(f"  dask overhead per part vs --jobs 2: {1000 * (td - t2) / N:+.1f} ms")


if __name__ == "__main__":
    main_bench()
