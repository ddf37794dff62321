"""Cage-motor cases for the Python checks: the invented pump motor of
cases/examples/pump_4p36s_voltage.toml with its cage's currents induced, on a coarse first-order
mesh. `linear` makes every iron linear (μr 1000) so that superposition and the fundamental's
slip relation hold exactly; `resistive_bars` gives the bars a made-up conductivity about a fiftieth of
die-cast aluminium's so that the cage's start-up transient dies within a few periods (the
relations checked hold for any resistance)."""
import os
import re


def cage_case(examples, path, slip, periods, steps_per_period=24, linear=True,
              resistive_bars=True, supply=None, feed_voltage=True, extra=""):
    s = open(os.path.join(examples, "pump_4p36s_voltage.toml")).read()
    s = re.sub(r'bar_currents = "imposed".*', 'bar_currents = "induced"', s)
    s = re.sub(r"\n\[rotor_currents\]\n.*?(?=\n\[)", "\n", s, flags=re.S)
    # The supply: balanced 400 V unless given.
    start, end = s.index("[supply]"), s.index("\n[mesh]")
    s = s[:start] + (supply or '[supply]\nfeed = "voltage"\nrms_v = 400.0\n') + s[end:]
    s = re.sub(r"\[mesh\]\n(.*?)(?=\n\[)", "[mesh]\norder = 1\nband_nodes = 1008\n"
               "airgap_size_mm = 0.45\n", s, flags=re.S)
    study = (f'[study]\nkind = "time_stepping"\nsteps_per_period = {steps_per_period}\n'
             f"periods = {periods}\ndiscard_periods = {periods - 1}\nmotion = \"slip\"\n"
             f"slip = {slip}\n")
    s = re.sub(r"\[study\]\n.*?(?=\n\[output\])", study, s, flags=re.S)
    s = s.replace("fields_every = 12", "fields_every = 100000")
    materials = ""
    if linear:
        materials += ('stator_iron = "linear_steel"\nrotor_iron = "linear_steel"\n'
                      'shaft = "linear_steel"\n')
    if resistive_bars:
        materials += 'bars = "resistive_alloy"\n'
    defs = ""
    if linear:
        defs += '[materials.define.linear_steel]\nkind = "steel"\nrelative_permeability = 1000.0\n'
    if resistive_bars:
        defs += ('[materials.define.resistive_alloy]\nkind = "conductor"\n'
                 "conductivity_s_per_m = 5.0e5\ntemperature_coefficient_per_k = 0.0\n")
    if materials:
        s = s.replace("[supply]", "[materials]\n" + materials + defs + "\n[supply]", 1)
    open(path, "w").write(s + extra)
    return path


COARSE_DEMO_MESH = "[mesh]\norder = 1\nband_nodes = 1008\nairgap_size_mm = 0.45\n"


def coarse_demo(examples, name, steps_per_period=None):
    """The demo case `name` as it is (saturated iron, die-cast cage) on a coarse first-order mesh,
    without field snapshots; with `steps_per_period`, its 108 steps per period (and the comment
    line after them) replaced."""
    s = open(os.path.join(examples, name)).read()
    s = re.sub(r"\[mesh\]\n(.*?)(?=\n\[)", COARSE_DEMO_MESH, s, flags=re.S)
    if steps_per_period:
        s = re.sub(r"steps_per_period = 108.*\n.*\n", f"steps_per_period = {steps_per_period}\n", s)
    return s.replace("fields_every = 12", "fields_every = 100000")
