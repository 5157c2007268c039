"""Figures for issue 14: one whole slice of Cremona's table through the distributed engine; nothing is
asserted.

    python bench/bench_slice.py [--file ell499.gz] [--folder /usr/share/pari/elldata]

Every curve of one file of PARI's curve-data package (Debian pari-elldata; ``ell499.gz`` holds the
5,997 curves of conductor 499,000–499,999) goes through ``certify batch --cluster --only torsion --only
isogeny-class`` (the two kinds PARI's elltors and ellisomat answer) on a two-worker
Dask LocalCluster started here (one thread per worker), into a SQLite store, and then through
``certify verify --quiet --workers 2``. For each: wall-clock time, curves and certificates per
second, and the peak resident memory of the process tree (all processes together, and the largest
one), sampled every 0.2 s. Then the time a table of 3 million curves would need per core at the
measured rates. The load average is printed before each run: other work on the 2 cores slows both.
"""
from __future__ import annotations

import argparse
import os
import subprocess
import sys
import tempfile
import threading
import time
from pathlib import Path

import psutil

ROOT = Path(__file__).resolve().parent.parent
sys.path.insert(0, str(ROOT / "tests" / "data"))

from extract_table import rows  # noqa: E402

TABLE_SIZE = 3_000_000
"""Curves in the table the projection is for."""


def tree_memory(processes: list) -> tuple[int, int]:
    """(total RSS, largest RSS) in bytes over the processes and all their descendants."""
    sizes = []
    for process in processes:
        try:
            family = [process] + process.children(recursive=True)
        except psutil.NoSuchProcess:
            continue
        for member in family:
            try:
                sizes.append(member.memory_info().rss)
            except psutil.NoSuchProcess:
                pass
    return sum(sizes), max(sizes, default=0)


def run_measured(command: list, watched: list) -> tuple[float, int, int]:
    """(seconds, peak total RSS, peak largest RSS) of one command, whose process tree and the ``watched``
    processes' trees are sampled while it runs; the command must succeed."""
    peaks = [0, 0]
    started = time.perf_counter()
    child = subprocess.Popen(command, cwd=ROOT, stdout=subprocess.DEVNULL, stderr=subprocess.DEVNULL)
    done = threading.Event()

    def sample():
        while not done.is_set():
            total, largest = tree_memory([psutil.Process(child.pid)] + watched)
            peaks[0], peaks[1] = max(peaks[0], total), max(peaks[1], largest)
            done.wait(0.2)

    sampler = threading.Thread(target=sample)
    sampler.start()
    status = child.wait()
    seconds = time.perf_counter() - started
    done.set()
    sampler.join()
    if status:
        raise SystemExit(f"{' '.join(command)} exited with status {status}")
    return seconds, peaks[0], peaks[1]


def load() -> str:
    return "load " + "/".join(f"{value:.2f}" for value in os.getloadavg())


def main() -> None:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--folder", default="/usr/share/pari/elldata")
    parser.add_argument("--file", default="ell499.gz")
    args = parser.parse_args()
    from distributed import LocalCluster

    curves = [coefficients for _, _, coefficients in rows(Path(args.folder), 10 ** 9, args.file)]
    mib = 1 / 2 ** 20
    with tempfile.TemporaryDirectory() as folder:
        source, store = os.path.join(folder, "slice.txt"), os.path.join(folder, "slice.sqlite")
        with open(source, "w") as out:
            out.write("".join("[" + ",".join(map(str, a)) + "]\n" for a in curves))
        print(f"{len(curves)} curves of {args.file}, a torsion and an isogeny-class certificate each")
        with LocalCluster(n_workers=2, threads_per_worker=1, dashboard_address=None, processes=True) as cluster:
            workers = [psutil.Process(worker.process.pid) for worker in cluster.workers.values()]
            before = load()
            seconds, total, largest = run_measured(
                [sys.executable, "-m", "certify", "batch", source, "-o", store, "--cluster", cluster.scheduler_address,
                 "--only", "torsion", "--only", "isogeny-class"],
                workers)
        certify_rate = len(curves) / seconds
        print(f"  certify batch --cluster (LocalCluster, 2 workers)  {seconds:7.1f} s  {certify_rate:6.1f} curves/s  "
              f"{2 * certify_rate:6.1f} certificates/s  peak RSS {total * mib:.0f} MiB in all, "
              f"{largest * mib:.0f} MiB the largest process  ({before} before)", flush=True)
        before = load()
        seconds, total, largest = run_measured(
            [sys.executable, "-m", "certify", "verify", "--quiet", "--workers", "2", store], [])
        verify_rate = len(curves) / seconds
        print(f"  certify verify --workers 2                        {seconds:7.1f} s  {verify_rate:6.1f} curves/s  "
              f"{2 * verify_rate:6.1f} certificates/s  peak RSS {total * mib:.0f} MiB in all, "
              f"{largest * mib:.0f} MiB the largest process  ({before} before)")
    per_core = {name: TABLE_SIZE / (rate / 2) / 3600 for name, rate in (("certify", certify_rate), ("verify", verify_rate))}
    print(f"a table of {TABLE_SIZE:,} curves at these rates: certify {per_core['certify']:.0f} core-hours, "
          f"verify {per_core['verify']:.0f} core-hours (both certificates per curve)")


if __name__ == "__main__":
    main()
