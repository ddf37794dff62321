"""Case text shared by the Python FE checks: the invented 4-pole, 24-slot reference stator of
cases/examples/reference_radial_4p24s.toml without its supply, linear iron, and a short
locked-rotor time-stepping study on a coarse mesh."""
import os

LINEAR_IRON = """
[materials]
stator_iron = "linear_iron"
rotor_iron = "linear_iron"
[materials.define.linear_iron]
kind = "steel"
relative_permeability = 1000.0
"""

COARSE_MESH = """
[mesh]
airgap_size_mm = 0.5
iron_size_mm = 6.0
"""


def reference_without_supply(examples):
    text = open(os.path.join(examples, "reference_radial_4p24s.toml")).read()
    return text[: text.index("[supply]")]


def locked_study(steps_per_period):
    return f"""
[study]
kind = "time_stepping"
steps_per_period = {steps_per_period}
periods = 1
motion = "locked"
"""
