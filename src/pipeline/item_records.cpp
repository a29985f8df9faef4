#include "ember/pipeline/item_records.hpp"

#include <fmt/format.h>

#include <cmath>
#include <optional>

#include "ember/core/errors.hpp"
#include "ember/core/record.hpp"

namespace ember::pipeline {

namespace {

void write(RecordWriter& w, const population::Response& r) {
  const auto& f = r.formation;
  const auto& d = r.decay;
  w.word("response").real(r.mass).real(r.lightcone_per_beta).real(r.hubble_per_beta).real(r.f_per_beta);
  w.real(r.count_per_beta).real(f.mass).real(f.time).real(f.scale_factor).real(f.temperature).real(f.total_density);
  w.real(d.hazard).real(d.hazard_in_time).real(d.probability).flag(d.evaporated).real(d.lifetime).real(d.end_mass);
  w.maybe_real(d.crossover_mass).real(d.branching_at_crossover).real(d.decay_time).real(d.lightcone_radius);
  w.flag(d.decays_below_floor).flag(d.formed_below_floor);
  for (const population::Treatment* t : {&d.counted, &d.postponed})
    w.real(t->hazard).real(t->probability).real(t->decay_time).real(t->lightcone_radius);
  w.real(d.probability_semiclassical).real(d.plasma_at_decay).real(d.plasma_at_crossover).maybe_real(d.cooled_time);
  w.real(r.lightcone_per_beta_counted).real(r.lightcone_per_beta_postponed).real(r.lightcone_per_beta_semiclassical);
  w.maybe_real(std::isfinite(d.gate_mass) ? std::optional<double>(d.gate_mass) : std::nullopt);
  w.maybe_real(d.spin_at_crossover).flag(d.spinning_crossover);
  w.real(r.lightcone_per_beta_spinning).real(r.spinning_crossover_share);
  w.end_line();
}

population::Response read_response(RecordReader& in) {
  population::Response r;
  auto& f = r.formation;
  auto& d = r.decay;
  in.expect("response");
  r.mass = in.real();
  r.lightcone_per_beta = in.real();
  r.hubble_per_beta = in.real();
  r.f_per_beta = in.real();
  r.count_per_beta = in.real();
  f.mass = in.real();
  f.time = in.real();
  f.scale_factor = in.real();
  f.temperature = in.real();
  f.total_density = in.real();
  d.hazard = in.real();
  d.hazard_in_time = in.real();
  d.probability = in.real();
  d.evaporated = in.flag();
  d.lifetime = in.real();
  d.end_mass = in.real();
  d.crossover_mass = in.maybe_real();
  d.branching_at_crossover = in.real();
  d.decay_time = in.real();
  d.lightcone_radius = in.real();
  d.decays_below_floor = in.flag();
  d.formed_below_floor = in.flag();
  for (population::Treatment* t : {&d.counted, &d.postponed}) {
    t->hazard = in.real();
    t->probability = in.real();
    t->decay_time = in.real();
    t->lightcone_radius = in.real();
  }
  d.probability_semiclassical = in.real();
  d.plasma_at_decay = in.real();
  d.plasma_at_crossover = in.real();
  d.cooled_time = in.maybe_real();
  r.lightcone_per_beta_counted = in.real();
  r.lightcone_per_beta_postponed = in.real();
  r.lightcone_per_beta_semiclassical = in.real();
  d.gate_mass = in.maybe_real().value_or(HUGE_VAL);
  d.spin_at_crossover = in.maybe_real();
  d.spinning_crossover = in.flag();
  r.lightcone_per_beta_spinning = in.real();
  r.spinning_crossover_share = in.real();
  return r;
}

}  // namespace

std::string to_text(const ItemResult& u) {
  RecordWriter w;
  w.word("ember-item").whole(3).end_line();
  w.word("rows").whole(static_cast<long long>(u.beta_max.size()));
  for (std::size_t i = 0; i < u.beta_max.size(); ++i) w.maybe_real(u.beta_max[i]).maybe_real(u.f_max[i]);
  w.end_line();
  w.word("scan").whole(static_cast<long long>(u.scan.size())).end_line();
  for (const auto& r : u.scan) write(w, r);
  const auto& c = u.counts;
  w.word("counts").real(c.lightcone).real(c.hubble).real(c.f_pbh).real(c.beta).real(c.from_evaporated);
  w.real(c.lightcone_counted).real(c.lightcone_postponed).real(c.lightcone_semiclassical).end_line();
  w.word("plot").whole(static_cast<long long>(u.plot_ratio.size()));
  for (double x : u.plot_ratio) w.real(x);
  for (bool low : u.plot_low_action) w.flag(low);
  w.end_line();
  w.word("cache").word(!u.cache_hit ? "-" : *u.cache_hit ? "1" : "0").end_line();
  w.text_line("summary", u.table_summary);
  w.text_line("failure", u.failure);
  w.word("row_failures").whole(static_cast<long long>(u.row_failures.size())).end_line();
  for (const auto& f : u.row_failures) w.text_line("row", f);
  return w.str();
}

ItemResult item_from_text(const std::string& text, const std::string& what) {
  RecordReader in(text, what);
  ItemResult u;
  in.expect("ember-item");
  in.expect("3");
  in.expect("rows");
  const long long rows = in.whole();
  for (long long i = 0; i < rows; ++i) {
    u.beta_max.push_back(in.maybe_real());
    u.f_max.push_back(in.maybe_real());
  }
  in.expect("scan");
  const long long n = in.whole();
  for (long long i = 0; i < n; ++i) u.scan.push_back(read_response(in));
  in.expect("counts");
  u.counts = {in.real(), in.real(), in.real(), in.real(), in.real(), in.real(), in.real(), in.real()};
  in.expect("plot");
  const long long p = in.whole();
  for (long long i = 0; i < p; ++i) u.plot_ratio.push_back(in.real());
  for (long long i = 0; i < p; ++i) u.plot_low_action.push_back(in.flag());
  in.expect("cache");
  const std::string cache = in.word();
  if (cache != "-") u.cache_hit = cache == "1";
  u.table_summary = in.text_line("summary");
  u.failure = in.text_line("failure");
  in.expect("row_failures");
  const long long f = in.whole();
  for (long long i = 0; i < f; ++i) u.row_failures.push_back(in.text_line("row"));
  return u;
}

std::string to_text(const TableRecord& t) {
  RecordWriter w;
  const char* state = t.state == TableRecord::State::table    ? "table"
                      : t.state == TableRecord::State::failed ? "failed"
                                                              : "none";
  w.word("ember-table").whole(2).word(state).word(!t.cache_hit ? "-" : *t.cache_hit ? "1" : "0").end_line();
  w.text_line("failure", t.failure);
  w.text_line("cache_failure", t.cache_failure);
  return w.str() + t.table;  // the table's own text, to the end
}

TableRecord table_from_text(const std::string& text, const std::string& what) {
  std::size_t end = 0;  // past the three header lines
  for (int line = 0; line < 3 && end != std::string::npos; ++line) {
    end = text.find('\n', end);
    if (end != std::string::npos) ++end;
  }
  if (end == std::string::npos) throw InputError(what + ": a table record needs three header lines");
  RecordReader in(text.substr(0, end), what);
  TableRecord t;
  in.expect("ember-table");
  in.expect("2");
  const std::string state = in.word();
  if (state == "table")
    t.state = TableRecord::State::table;
  else if (state == "failed")
    t.state = TableRecord::State::failed;
  else if (state == "none")
    t.state = TableRecord::State::no_decay;
  else
    throw InputError(fmt::format("{}: table state \"{}\"; expected table, failed or none", what, state));
  const std::string cache = in.word();
  if (cache != "-") t.cache_hit = cache == "1";
  t.failure = in.text_line("failure");
  t.cache_failure = in.text_line("cache_failure");
  t.table = text.substr(end);
  return t;
}

}  // namespace ember::pipeline
