"""Cluster builds: a 200-part series through a local Dask cluster (loopback only) gives the
same bytes as a local ``--jobs 2`` build, and survives a worker killed mid-build."""

import json
import os
import signal
import socket
import subprocess
import sys
import threading
import time

import pytest

distributed = pytest.importorskip("distributed", reason="dask.distributed is the 'cluster' "
                                  "extra (installed with the test extra)")

from gen.cli import main  # noqa: E402

CATALOGUE = """
series:
  catalogue:
    kind: rack
    name: "cat_{face_width}_{length}"
    vary: {face_width: [4, 6], length: "10..109"}
    values: {module: 1, height: 5, chord_tolerance: 0.05}
"""


@pytest.fixture(scope="module")
def catalogue(tmp_path_factory):
    root = tmp_path_factory.mktemp("cat")
    path = root / "catalogue.yaml"
    path.write_text(CATALOGUE)
    local = root / "local"
    assert main(["build", str(path), "--out", str(local), "--format", "stl", "--jobs", "2"]) == 0
    return path, local


def _free_port():
    with socket.socket() as s:
        s.bind(("127.0.0.1", 0))
        return s.getsockname()[1]


@pytest.fixture(scope="module")
def cluster():
    """A scheduler and two workers as separate processes on loopback (no nanny: a killed
    worker stays dead, as a lost machine would)."""
    dask = os.path.join(os.path.dirname(sys.executable), "dask")
    port = _free_port()
    address = f"tcp://127.0.0.1:{port}"
    env = dict(os.environ, PYTHONPATH=os.pathsep.join(sys.path))
    procs = [subprocess.Popen([dask, "scheduler", "--host", "127.0.0.1", "--port", str(port),
                               "--no-dashboard"], env=env, stdout=subprocess.DEVNULL,
                              stderr=subprocess.DEVNULL)]
    for _ in range(2):
        procs.append(subprocess.Popen([dask, "worker", address, "--no-nanny", "--nthreads", "1",
                                       "--host", "127.0.0.1", "--no-dashboard"], env=env,
                                      stdout=subprocess.DEVNULL, stderr=subprocess.DEVNULL))
    from distributed import Client

    with Client(address, timeout="60s") as client:
        client.wait_for_workers(2, timeout=120)
    try:
        yield address, procs[1:]
    finally:
        for p in procs:
            p.kill()
            p.wait(timeout=30)


def _files(folder):
    doc = json.loads((folder / "manifest.json").read_text())
    return {n: p["files"] for n, p in doc["parts"].items()}


def test_dask_build_equals_local_build(catalogue, cluster, tmp_path):
    path, local = catalogue
    address, _ = cluster
    out = tmp_path / "dask"
    assert main(["build", str(path), "--out", str(out), "--format", "stl",
                 "--executor", "dask", "--scheduler", address]) == 0
    files = _files(out)
    assert len(files) == 200
    assert files == _files(local)   # same names, byte counts and SHA-256 per file
    # incremental: nothing to do the second time
    assert main(["build", str(path), "--out", str(out), "--format", "stl",
                 "--executor", "dask", "--scheduler", address]) == 0
    doc = json.loads((out / "manifest.json").read_text())
    assert {p["status"] for p in doc["parts"].values()} == {"up_to_date"}


def test_a_worker_killed_mid_build_is_survived(catalogue, cluster, tmp_path):
    _, local = catalogue
    address, workers = cluster
    # a part of the same catalogue (same names and values, so the same bytes)
    path = tmp_path / "part.yaml"
    path.write_text(CATALOGUE.replace('"10..109"', '"10..49"').replace("[4, 6]", "[4]"))
    out = tmp_path / "killed"
    killed = []

    def kill_when_started():
        deadline = time.time() + 120
        while time.time() < deadline:
            if out.exists() and len([f for f in os.listdir(out) if f.endswith(".stl")]) >= 5:
                os.kill(workers[0].pid, signal.SIGKILL)
                killed.append(workers[0].pid)
                return
            time.sleep(0.05)

    t = threading.Thread(target=kill_when_started)
    t.start()
    code = main(["build", str(path), "--out", str(out), "--format", "stl",
                 "--executor", "dask", "--scheduler", address])
    t.join()
    assert killed, "the build finished before a worker could be killed"
    assert code == 0
    got, ref = _files(out), _files(local)
    assert len(got) == 40 and got == {n: ref[n] for n in got}
    # no partial or temporary file is left in the output folder
    assert sorted(os.listdir(out)) == sorted(["manifest.json", "report.html"] + [f"{n}.stl" for n in got])
