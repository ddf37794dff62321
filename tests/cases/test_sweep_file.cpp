// The sweep file: ranges become their values (ends included, decimal ends exact, integer ranges
// integers), the generated case text carries the values, and bad sweep files name the line.
#include <catch2/catch.hpp>

#include "cases/case_reader.hpp"
#include "cases/sweep_file.hpp"
#include "test_support.hpp"

using namespace gapflux;

namespace {

const char* base_head = "[sweep]\nbase_case = \"base.toml\"\n";

SweepSpec spec_of(const std::string& vary) {
  return read_sweep_text(std::string(base_head) + vary, "sweep.toml");
}

}  // namespace

TEST_CASE("ranges expand to their values, both ends included", "[cases][sweep]") {
  const SweepSpec s = spec_of(
      "[[sweep.vary]]\nkey = \"study.slip\"\nrange = { from = 0.01, to = 0.03, step = 0.01 }\n"
      "[[sweep.vary]]\nkey = \"stator.slots\"\nrange = { from = 24, to = 48, count = 3 }\n");
  REQUIRE(s.parameters.size() == 2);
  const auto& slip = s.parameters[0].values;
  REQUIRE(slip.size() == 3);
  CHECK(slip[0].number == 0.01);
  CHECK(slip[1].number == Approx(0.02).epsilon(1e-15));
  CHECK(slip[2].number == 0.03);  // the end itself, not 0.01 + 2·0.01
  const auto& slots = s.parameters[1].values;
  REQUIRE(slots.size() == 3);
  CHECK(slots[1].kind == SweepValue::Kind::integer);
  CHECK(slots[1].integer == 36);
  CHECK(s.combine == SweepCombine::product);
  CHECK(s.lean);
}

TEST_CASE("a falling range and mixed value kinds", "[cases][sweep]") {
  const SweepSpec s = spec_of(
      "[[sweep.vary]]\nkey = \"supply.rms_v\"\nrange = { from = 400.0, to = 380.0, step = 10.0 "
      "}\n[[sweep.vary]]\nkey = \"rotor.bar.shape\"\nvalues = [\"teardrop\", \"round\"]\n");
  CHECK(s.parameters[0].values.size() == 3);
  CHECK(s.parameters[0].values[1].number == 390.0);
  CHECK(s.parameters[1].values[1].display() == "round");
}

TEST_CASE("bad sweep files are refused naming file, line and key", "[cases][sweep]") {
  const auto refused = [](const std::string& vary, int line, const std::string& words) {
    try {
      spec_of(vary);
      FAIL("accepted: " << vary);
    } catch (const InputError& e) {
      CHECK(e.file() == "sweep.toml");
      CHECK(e.pos().line == line);
      CHECK_THAT(e.what(), Catch::Matchers::Contains(words));
    }
  };
  refused("[[sweep.vary]]\nkey = \"a\"\nrange = { from = 1.0, to = 2.0, count = 1 }\n", 5, "count");
  refused("[[sweep.vary]]\nkey = \"a\"\nrange = { from = 1.0, to = 2.0, step = 0.3 }\n", 5,
          "whole steps");
  refused("[[sweep.vary]]\nkey = \"a\"\nvalues = [1.0, true]\n", 5, "one kind");
  refused("[[sweep.vary]]\nkey = \"a..b\"\nvalues = [1.0]\n", 4, "dotted case key");
  refused(
      "[[sweep.vary]]\nkey = \"a\"\nvalues = [1.0]\n[[sweep.vary]]\nkey = \"a\"\nvalues = "
      "[2.0]\n",
      6, "varied twice");
  refused("[[sweep.vary]]\nkey = \"a\"\nvalues = [1.0]\nstep = 3\n", 6, "step");
}

TEST_CASE("a generated case holds the values and reads as a case", "[cases][sweep]") {
  const std::string base = test::read_text(test::example("pump_4p36s_voltage.toml"));
  SweepValue v;
  v.number = 391.0;
  SweepValue order;
  order.kind = SweepValue::Kind::integer;
  order.integer = 1;
  order.number = 1.0;
  const std::string text =
      case_text_with(base, test::example("pump_4p36s_voltage.toml"),
                     {{"supply.phases.bc.rms_v", v}, {"mesh.order", order}}, "/tmp");
  const Case c = read_case_text(text, "generated.toml");
  CHECK(c.mesh.order == 1);
  CHECK(c.supply.phases[1].rms == Approx(391.0));  // b-c line voltage is the second
  SweepValue word;
  word.kind = SweepValue::Kind::text;
  word.text = "x";
  CHECK_THROWS_AS(case_text_with(base, "base.toml", {{"machine.name.first", word}}, "/tmp"),
                  InputError);
}
