"""A small, fast time-stepping case for the output-handling checks: the invented 4-pole, 24-slot
reference stator with its smooth rotor turning at 5 % slip, 24 steps on the coarse mesh, one
snapshot. Its physics is not what those checks look at."""
import os

from reference_case import COARSE_MESH, reference_without_supply


def small_case(examples, tmp, name="small.toml", slip=0.05, fields_every=100, steps=24):
    text = reference_without_supply(examples) + f"""
[supply]
frequency_hz = 50.0
rms_a = 10.0
{COARSE_MESH}
[study]
kind = "time_stepping"
steps_per_period = 24
periods = {steps / 24}
motion = "slip"
slip = {slip}

[output]
fields_every = {fields_every}
"""
    path = os.path.join(tmp, name)
    open(path, "w").write(text)
    return path
