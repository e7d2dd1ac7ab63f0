"""Reference for the dataset audit bench: read the dataset's Parquet file with pyarrow and do the same
timed-replay audit with numpy (range runs, speed-over runs, glitches, gaps, invalid episodes), printing
the summary as JSON. Same rules as kinematics/recordings/timed-replay.ts; the two must agree."""
import json
import sys

import numpy as np
import pyarrow.parquet as pq

TOL = 1 + 1e-12
GAP_FACTOR = 1.5

parquet_path, arm_path = sys.argv[1], sys.argv[2]
with open(arm_path) as f:
    arm = json.load(f)
names = [j["name"] for j in arm["joints"]]
lo = np.array([j["min"] for j in arm["joints"]])
hi = np.array([j["max"] for j in arm["joints"]])
v = np.array([j["maxVelocity"] for j in arm["joints"]])
ratio = arm.get("cautionRatio", 0.9)

table = pq.read_table(parquet_path, columns=["episode", "t", *names])
episode = table.column("episode").to_numpy(zero_copy_only=False)
t_all = table.column("t").to_numpy()
q_all = np.column_stack([table.column(n).to_numpy() for n in names])

# episodes are contiguous runs of the episode column, in order of appearance
change = np.flatnonzero(episode[1:] != episode[:-1]) + 1
bounds = np.concatenate(([0], change, [len(episode)]))

summary = {"episodes": 0, "pass": 0, "caution": 0, "fault": 0, "invalid": 0, "byKind": {}}


def count(kind, n):
    if n:
        summary["byKind"][kind] = summary["byKind"].get(kind, 0) + int(n)


def run_starts(mask):
    """Per column, the start of each run of True (mask is frames × joints)."""
    prev = np.zeros_like(mask)
    prev[1:] = mask[:-1]
    return mask & ~prev


for a, b in zip(bounds[:-1], bounds[1:]):
    summary["episodes"] += 1
    t = t_all[a:b]
    q = q_all[a:b]
    n = b - a
    if n < 2 or not np.isfinite(t).all() or not np.isfinite(q).all() or not (np.diff(t) > 0).all():
        summary["invalid"] += 1
        continue
    dt = np.diff(t)
    fault_any = False
    caution_any = False
    # gap: a step above 1.5 × the median step
    gaps = int((dt > GAP_FACTOR * np.median(dt) * TOL).sum())
    count("gap", gaps)
    caution_any |= gaps > 0
    # range: runs of frames outside the travel
    ranges = int(run_starts((q < lo) | (q > hi)).sum())
    count("range", ranges)
    fault_any |= ranges > 0
    # speed: |Δq| against v·Δt (fault) and ratio·v·Δt (caution)
    dq = np.diff(q, axis=0)
    step = np.abs(dq)
    fault = step > (v * TOL) * dt[:, None]
    offending = step > (ratio * v * TOL) * dt[:, None]
    # glitch candidates at step i (frame i+1): steps i and i+1 faults of opposite sign, neighbours agree
    agree = np.abs(q[2:] - q[:-2]) <= (v * TOL) * (t[2:] - t[:-2])[:, None]
    cand = fault[:-1] & fault[1:] & (dq[:-1] * dq[1:] < 0) & agree
    glitches = 0
    if cand.any():
        consumed = np.zeros_like(offending)
        for j in np.flatnonzero(cand.any(axis=0)):
            taken_prev = -2
            for i in np.flatnonzero(cand[:, j]):
                if i == taken_prev + 1:
                    continue  # step i belongs to the glitch at frame i
                consumed[i, j] = consumed[i + 1, j] = True
                taken_prev = i
                glitches += 1
        offending &= ~consumed
        fault &= ~consumed
    count("glitch", glitches)
    fault_any |= glitches > 0
    starts = run_starts(offending)
    runs = int(starts.sum())
    count("speed-over", runs)
    if runs:
        # a run is a fault if any of its steps is: label runs per joint and look for faults in them
        labels = np.cumsum(starts, axis=0) * offending
        for j in np.flatnonzero(starts.any(axis=0)):
            with_fault = np.unique(labels[fault[:, j], j])
            n_runs = int(starts[:, j].sum())
            faulty = int((with_fault > 0).sum())
            fault_any |= faulty > 0
            caution_any |= n_runs > faulty
    if fault_any:
        summary["fault"] += 1
    elif caution_any:
        summary["caution"] += 1
    else:
        summary["pass"] += 1

print(json.dumps(summary))
