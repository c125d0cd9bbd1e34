#!/usr/bin/env python3
"""The side-by-side reference for the capture-reading benchmark (scripts/bench/captureSpeed.ts): reads a CSV capture
(`t,sync,ramp,gate[,control]`, seconds and volts) with pandas' C parser and computes, vectorised with numpy, the mains
frequency, the mean firing angle and the median ramp peak, the way an engineer would script it. It prints one JSON
line: the three readings and its own wall time for reading and for computing (imports excluded).

Method (plain, vectorised, common practice):
- sync zero crossings with hysteresis (+-30 % of the amplitude, like Rampwright's tracker), each instant interpolated
  linearly between the two samples around zero (IEEE 181 crossing instants);
- frequency: least-squares line through the crossing instants against their count (each a half period apart);
- alpha: gate rising edges at the 50 % level between the gate's low and high levels, interpolated, measured from the
  crossing before each edge, in degrees of the mains period;
- ramp peak: the largest ramp sample of each half cycle, then the median.
Usage: python3 pandasCapture.py <capture.csv>
"""
import json
import sys
import time

import numpy as np
import pandas as pd


def crossing_instants(times, values, threshold, band):
    """Rising and falling crossings of `threshold` with hysteresis `band`, as interpolated instants (s), in order."""
    level = np.where(values > threshold + band, 1, np.where(values < threshold - band, -1, 0))
    state = pd.Series(level).replace(0, np.nan).ffill().to_numpy()
    confirmed = np.flatnonzero(state[1:] * state[:-1] < 0) + 1
    below = values < threshold
    raw = np.flatnonzero(below[:-1] != below[1:])
    # The crossing of each confirmed change: the last raw crossing before it.
    last_raw = raw[np.searchsorted(raw, confirmed, side="left") - 1]
    t0, t1 = times[last_raw], times[last_raw + 1]
    v0, v1 = values[last_raw], values[last_raw + 1]
    return t0 + (threshold - v0) * (t1 - t0) / (v1 - v0)


def analyze(path):
    started = time.perf_counter()
    frame = pd.read_csv(path, engine="c", dtype=np.float64)
    read_s = time.perf_counter() - started
    t = frame["t"].to_numpy()
    sync = frame["sync"].to_numpy()
    ramp = frame["ramp"].to_numpy()
    gate = frame["gate"].to_numpy()

    offset = sync.mean()
    amplitude = (sync.max() - sync.min()) / 2
    crossings = crossing_instants(t, sync, offset, 0.3 * amplitude)
    slope, _ = np.polyfit(np.arange(crossings.size), crossings, 1)
    frequency_hz = 1 / (2 * slope)

    low, high = np.percentile(gate, [5, 95])
    mid = (low + high) / 2
    above = gate >= mid
    rises = np.flatnonzero(~above[:-1] & above[1:])
    edges = t[rises] + (mid - gate[rises]) * (t[rises + 1] - t[rises]) / (gate[rises + 1] - gate[rises])
    before = np.searchsorted(crossings, edges) - 1
    valid = before >= 0
    alpha_deg = ((edges[valid] - crossings[before[valid]]) * frequency_hz * 360).mean()

    boundaries = np.searchsorted(t, crossings)
    boundaries = boundaries[(boundaries > 0) & (boundaries < t.size)]
    peaks = np.maximum.reduceat(ramp, boundaries)[:-1]
    ramp_peak_v = float(np.median(peaks))
    compute_s = time.perf_counter() - started - read_s
    return {
        "frequencyHz": float(frequency_hz),
        "alphaMeanDeg": float(alpha_deg),
        "rampPeakMedianV": ramp_peak_v,
        "readS": read_s,
        "computeS": compute_s,
    }


if __name__ == "__main__":
    print(json.dumps(analyze(sys.argv[1])))
