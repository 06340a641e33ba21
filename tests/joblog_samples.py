"""Representative saved entries, one per kind, for the job-log tests.

Each result has the keys its command's issue specifies for ``--json``. Values
are worked by hand from the relations in the design notes, with c0 the SI
value (BIPM, SI Brochure: 299 792 458 m/s exactly); the scenario is invented.
"""

from __future__ import annotations

import math

C0 = 299_792_458.0  # SI definition of the metre


def _locate() -> dict:
    # distance = VF c0 t / 2 (design notes); RG-58 family VF 0.66 (REFERENCES.md, high)
    d = 0.66 * C0 * 245e-9 / 2
    return {"distance_m": d, "distance_low_m": d * 0.97, "distance_high_m": d * 1.03, "vf": 0.66,
            "round_trip_delay_s": 245e-9, "resolution_m": 0.66 * C0 * 1e-9 / 2}


def _cut() -> dict:
    # physical length = (theta/360) VF c0 / f
    wl = 0.66 * C0 / 146e6
    return {"physical_length_m": wl / 4, "cut_length_m": wl / 4 + 0.02,
            "wavelength_in_line_m": wl, "multiple": 1}


def _harness() -> dict:
    # four 50 ohm antennas on a 50 ohm feed: each arm must present 4 x 50 = 200 ohm, a
    # quarter-wave transformer of sqrt(50 x 200) = 100 ohm (design notes)
    arm = {"cable_id": "rg62", "electrical_length_deg": 90.0,
           "physical_length_m": 0.84 * C0 / 146e6 / 4,
           "cut_length_m": 0.84 * C0 / 146e6 / 4 + 0.02}
    return {"arms": [dict(arm, arm=i) for i in range(1, 5)], "vswr_center": 1.08,
            "vswr_worst": 1.31, "ideal_impedance_ohm": 100.0}


def _echo() -> dict:
    # 75 ohm on 50 ohm: Gamma = 0.2, RL = -20 log10 0.2, VSWR = 1.5 (Pozar, ch. 2 relations)
    g = 25 / 125
    return {"gamma_real": g, "gamma_imag": 0.0, "return_loss_db": -20 * math.log10(g),
            "vswr": (1 + g) / (1 - g), "mismatch_loss_db": -10 * math.log10(1 - g * g),
            "step_start": g, "step_final": g, "time_constant_s": None}


def _waveform(n: int, end_m: float, open_at_m: float) -> dict:
    distance = [end_m * i / (n - 1) for i in range(n)]
    level = [0.0 if x < open_at_m else 1.0 for x in distance]
    return {"distance_m": distance, "time_s": [2 * x / (0.66 * C0) for x in distance],
            "level": level}


def _simulate() -> dict:
    wave = _waveform(512, 60.0, 40.0)
    return {**wave, "arrivals": [{"time_s": 2 * 40.0 / (0.66 * C0), "distance_m": 40.0,
                                  "size": 1.0, "path": "open load"}]}


def _trace() -> dict:
    wave = _waveform(2000, 80.0, 52.5)
    wave["level"] = [v - (0.15 if 20.0 <= x < 20.5 else 0.0)
                     for v, x in zip(wave["level"], wave["distance_m"], strict=True)]
    events = [
        {"round_trip_delay_s": 2 * 20.0 / (0.66 * C0), "distance_m": 20.0, "size": -0.15,
         "impedance_ohm": 50 * (1 - 0.15) / (1 + 0.15), "kind": "capacitive dip",
         "confidence": 0.7},
        {"round_trip_delay_s": 2 * 52.5 / (0.66 * C0), "distance_m": 52.5, "size": 1.0,
         "impedance_ohm": None, "kind": "open", "confidence": 0.95},
    ]
    return {**wave, "events": events, "unexpected": [events[0]], "missing": [],
            "misplaced": []}


# kind -> (inputs as typed, result)
SAMPLES: dict[str, tuple[dict, dict]] = {
    "locate": ({"delay": "245 ns", "cable": "rg58", "tolerance": "3 %"}, _locate()),
    "calibrate": ({"length": "30 m", "delay": "303.2 ns"},
                  {"vf": 2 * 30 / (C0 * 303.2e-9), "vf_low": 0.6581, "vf_high": 0.6621}),
    "cut": ({"frequency": "146 MHz", "degrees": "90", "vf": "0.66", "allowance": "10 mm"}, _cut()),
    "match": ({"from": "50 ohm", "to": "100 ohm", "frequency": "146 MHz"},
              {"ideal_impedance_ohm": math.sqrt(50 * 100),
               "candidates": [{"cable_id": "rg59", "parallel": False, "impedance_ohm": 75.0,
                               "vswr_center": 1.125, "vswr_worst": 1.14},
                              {"cable_id": "rg58", "parallel": False, "impedance_ohm": 50.0,
                               "vswr_center": 2.0, "vswr_worst": 2.0}]}),
    "harness": ({"antennas": "4", "antenna_z": "50 ohm", "feed_z": "50 ohm",
                 "frequency": "146 MHz"}, _harness()),
    "trim": ({"frequency": "146 MHz", "degrees": "90", "length": "400 mm",
              "measured_delay": "4.9 ns"},
             {"keep_length_m": 0.4 * (2 * 0.25 / 146e6) / 4.9e-9, "cut_off_m":
              0.4 - 0.4 * (2 * 0.25 / 146e6) / 4.9e-9}),
    "stub": ({"frequency": "146 MHz", "vf": "0.66", "end": "open", "present": "short"},
             {"physical_length_m": 0.66 * C0 / 146e6 / 4, "electrical_length_deg": 90.0}),
    "echo": ({"z0": "50 ohm", "load": "75 ohm"}, _echo()),
    "simulate": ({"run": "40 m:rg58", "load": "open", "points": "512"}, _simulate()),
    "trace": ({"file": "roof-feeder.csv", "cable": "rg58"}, _trace()),
}
