"""Writes tests/fuzz/case_keys.dict, libFuzzer's dictionary for the case reader: every snake_case
string literal of the readers (keys and words), each also as `key = `, the table headers, and a
few values that stress the checks.

Usage: /usr/bin/python3 tests/fuzz/make_dictionary.py   (from the repository's top folder)
"""
import re

SOURCES = ["cases/src/case_reader.cpp", "cases/src/supply_reader.cpp", "materials/src/library.cpp"]
TABLES = ["[machine]", "[stator]", "[stator.slot]", "[rotor]", "[rotor.bar]", "[winding]",
          "[materials]", "[materials.define.x]", "[supply]", "[supply.phases]", "[supply.sequence]",
          "[[supply.harmonics]]", "[supply.waveform]", "[mesh]", "[study]", "[rotor_currents]",
          "[solver]", "[output]"]
VALUES = ["= 0", "= -1", "= 1e308", "= nan", "= inf", '= \\"\\"', "= []", "= [1.0, 2.0]",
          "= { rms_a = 1.0 }", "= true"]

words = set()
for path in SOURCES:
    words.update(re.findall(r'"([a-z][a-z0-9_]{1,40})"', open(path).read()))
lines = ["# Keys, words and table headers of the case schema, for libFuzzer (-dict); written by",
         "# tests/fuzz/make_dictionary.py from the string literals of " + ", ".join(SOURCES) + "."]
entries = []
for w in sorted(words):
    entries += [w, w + " = "]
entries += ["\\x0A" + t + "\\x0A" for t in TABLES]
entries += [" " + v + "\\x0A" for v in VALUES]
lines += [f'k{i}="{e}"' for i, e in enumerate(entries)]
open("tests/fuzz/case_keys.dict", "w").write("\n".join(lines) + "\n")
print(f"{len(entries)} entries")
