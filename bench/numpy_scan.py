"""Reference for the bench: load the recording CSV with numpy and do the same finite-difference check
(step above maxVelocity / controlRateHz, speed above maxVelocity), counting offending steps per joint."""
import json
import sys
from pathlib import Path

import numpy as np

csv_path = Path(sys.argv[1])
arm = json.loads((csv_path.parent / "arm.json").read_text())
data = np.loadtxt(csv_path, delimiter=",", skiprows=1)
t, q = data[:, 0], data[:, 1:]
v_max = np.array([j["maxVelocity"] for j in arm["joints"]])
step = np.abs(np.diff(q, axis=0))
dt = np.diff(t)[:, None]
jumps = step > v_max / arm["controlRateHz"]
speed = step > v_max * dt
print(json.dumps({"samples": len(t), "jumps": jumps.sum(axis=0).tolist(), "speedOver": speed.sum(axis=0).tolist()}))
