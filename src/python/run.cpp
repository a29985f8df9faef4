// A whole scenario run (pipeline/, report/): from a scenario file or a Python dict with the same
// keys, returning the results (N, verdicts, constraint curves as arrays, summary.json as a dict)
// and writing the same files as `ember run` when asked. The run releases the GIL and stops at
// the next scan row on Ctrl-C.
#include "ember/pipeline/run.hpp"

#include <fmt/format.h>
#include <yaml-cpp/yaml.h>

#include <atomic>
#include <chrono>
#include <future>

#include "bindings.hpp"
#include "ember/core/cache.hpp"
#include "ember/core/errors.hpp"
#include "ember/core/parallel.hpp"
#include "ember/report/outputs.hpp"
#include "ember/tunnelling/prescription.hpp"

namespace ember::python {

namespace {

namespace u = ember::units;

// Thrown from the job's row hook once Python has seen Ctrl-C: not an Ember error kind, so no
// stage records it as a failed point, and the job unwinds.
struct Cancelled : std::runtime_error {
  Cancelled() : std::runtime_error("cancelled") {}
};

// A Python value as YAML: dicts, lists and tuples, strings, numbers, booleans and None.
YAML::Node yaml_of(py::handle v, const std::string& where) {
  if (py::isinstance<py::dict>(v)) {
    YAML::Node n(YAML::NodeType::Map);
    for (const auto& [k, value] : v.cast<py::dict>()) {
      if (!py::isinstance<py::str>(k))
        throw InputError(fmt::format("scenario dict: key {} at {}: expected a string key", std::string(py::repr(k)),
                                     where.empty() ? "the top" : where));
      const std::string key = k.cast<std::string>();
      n[key] = yaml_of(value, where.empty() ? key : where + "." + key);
    }
    return n;
  }
  if (py::isinstance<py::list>(v) || py::isinstance<py::tuple>(v)) {
    YAML::Node n(YAML::NodeType::Sequence);
    for (const auto& item : v) n.push_back(yaml_of(item, where));
    return n;
  }
  if (v.is_none()) return YAML::Node(YAML::NodeType::Null);
  if (py::isinstance<py::bool_>(v)) return YAML::Node(v.cast<bool>() ? "true" : "false");
  if (py::isinstance<py::int_>(v) || py::isinstance<py::float_>(v) || py::isinstance<py::str>(v))
    return YAML::Node(std::string(py::str(v)));
  throw InputError(fmt::format("scenario dict: {} at {}: a {}; expected a dict, list, string, number or bool",
                               std::string(py::repr(v)), where,
                               std::string(py::str(py::type::of(v).attr("__name__")))));
}

scenario::LoadedScenario load(py::handle scenario) {
  if (py::isinstance<py::dict>(scenario)) {
    YAML::Emitter out;
    out << yaml_of(scenario, "");
    // Block style, one key a line: the diagnostics' line numbers point into this text.
    return scenario::load_scenario_text(out.c_str(), "scenario (a Python dict)", std::filesystem::current_path());
  }
  const py::object os = py::module_::import("os");
  if (py::isinstance<py::str>(scenario) || py::isinstance(scenario, os.attr("PathLike")))
    return scenario::load_scenario_file(os.attr("fspath")(scenario).cast<std::string>());
  throw InputError("scenario: expected a scenario file's path or a dict with the keys of a scenario file");
}

// Runs `work` on a thread of its own with the GIL released, checking for Ctrl-C every 0.1 s;
// on Ctrl-C the work is told to stop (`cancel`), is waited for, and KeyboardInterrupt raised.
template <class Result, class Work>
Result interruptible(Work&& work) {
  std::atomic<bool> cancel{false};
  std::future<Result> done = std::async(std::launch::async, [&] { return work(cancel); });
  {
    py::gil_scoped_release unlocked;
    while (done.wait_for(std::chrono::milliseconds(100)) != std::future_status::ready) {
      py::gil_scoped_acquire locked;
      if (PyErr_CheckSignals() != 0) {
        cancel = true;
        break;
      }
    }
  }
  if (cancel) {
    {
      py::gil_scoped_release unlocked;
      done.wait();
    }
    try {
      (void)done.get();
    } catch (...) {  // Cancelled, or whatever stopped it first: the interrupt is the news
    }
    throw py::error_already_set();  // the KeyboardInterrupt PyErr_CheckSignals raised
  }
  return done.get();  // Ember's errors become InputError, NumericalError, OutputError
}

struct Finished {
  pipeline::JobResults results;
  std::vector<std::string> files;
};

py::dict curve_dict(const pipeline::PrescriptionOutcome& o) {
  std::vector<double> mass, width, beta, f, low, high;
  std::vector<bool> has_beta, has_f, has_low, has_high;
  const auto put = [](const std::optional<double>& v, std::vector<double>& x, std::vector<bool>& has) {
    x.push_back(v.value_or(0.0));
    has.push_back(v.has_value());
  };
  for (const auto& row : o.curve) {
    mass.push_back(row.mass / u::gram);
    width.push_back(row.width);
    put(row.beta_max, beta, has_beta);
    put(row.f_max, f, has_f);
    put(row.band_low, low, has_low);
    put(row.band_high, high, has_high);
  }
  py::dict d;
  d["mass_g"] = array(mass);
  d["width"] = array(width);
  d["beta_max"] = masked(beta, has_beta);
  d["f_max"] = masked(f, has_f);
  d["band_low"] = masked(low, has_low);
  d["band_high"] = masked(high, has_high);
  return d;
}

py::object maybe(const std::optional<double>& v) {
  return v ? py::object(py::float_(*v)) : py::object(py::none());
}

// The threshold searches per input (top_mass, ...): the window, the critical top mass, per
// prescription the two thresholds with their notes, and every evaluation as arrays (the rows of
// sensitivity.csv).
py::dict thresholds_dict(const pipeline::JobResults& r) {
  py::dict out;
  for (const auto& in : r.thresholds) {
    py::dict d, per;
    d["central"] = in.central;
    d["sigma"] = in.sigma;
    d["window"] = py::make_tuple(in.from, in.to);
    d["tolerance"] = in.tolerance;
    d["critical_top_mass"] = maybe(in.critical_top_mass);
    for (std::size_t k = 0; k < in.prescriptions.size(); ++k) {
      const auto& t = in.prescriptions[k];
      std::vector<double> value, n, ratio;
      std::vector<bool> has_n, has_ratio;
      for (const auto& s : in.samples) {
        if (s.prescription != k) continue;
        value.push_back(s.value);
        n.push_back(s.lightcone.value_or(0.0));
        has_n.push_back(s.lightcone.has_value());
        ratio.push_back(s.max_ratio.value_or(0.0));
        has_ratio.push_back(s.max_ratio.has_value());
      }
      py::dict p;
      p["threshold"] = maybe(t.exclusion.value);
      p["threshold_note"] = t.exclusion.note;
      p["outruns_threshold"] = maybe(t.outruns.value);
      p["outruns_threshold_note"] = t.outruns.note;
      p["value"] = array(value);
      p["N"] = masked(n, has_n);
      p["max_decay_to_evaporation"] = masked(ratio, has_ratio);
      per[py::str(tunnelling::name_of(r.outcomes.at(k).prescription))] = p;
    }
    d["prescriptions"] = per;
    out[py::str(scenario::name_of(in.input))] = d;
  }
  return out;
}

py::dict results_dict(const scenario::LoadedScenario& loaded, const Finished& done) {
  const pipeline::JobResults& r = done.results;
  py::dict out;
  const py::object summary = from_json_text(report::summary_json(loaded, r).dump());
  py::dict n, excluded, verdicts, curves;
  for (const auto& o : r.outcomes) {
    const py::str name(tunnelling::name_of(o.prescription));
    n[name] = o.counts.lightcone;
    excluded[name] = o.excluded;
    verdicts[name] = summary["prescriptions"][name]["verdict"];
    curves[name] = curve_dict(o);
  }
  out["title"] = loaded.scenario.title;
  out["N"] = n;
  out["excluded"] = excluded;
  out["verdicts"] = verdicts;
  out["curves"] = curves;
  out["thresholds"] = thresholds_dict(r);
  py::list failures;
  for (const auto& f : r.failures) failures.append(f.reason);
  out["failures"] = failures;
  out["summary"] = summary;
  if (!done.files.empty()) out["files"] = done.files;
  return out;
}

py::dict run(py::handle scenario, py::handle output, int threads, py::handle cache_dir, bool use_cache, bool quiet,
             bool adopt_folder) {
  const scenario::LoadedScenario loaded = load(scenario);
  if (threads < 0 || threads > 1024)
    throw InputError(fmt::format("threads {}: expected 0 (every core) to 1024", threads));
  const int workers = threads > 0 ? threads : default_threads();
  std::optional<std::filesystem::path> cache;
  if (!cache_dir.is_none()) cache = py::module_::import("os").attr("fspath")(cache_dir).cast<std::string>();
  std::optional<std::filesystem::path> out;
  if (!output.is_none()) out = py::module_::import("os").attr("fspath")(output).cast<std::string>();
  const Finished done = interruptible<Finished>([&](const std::atomic<bool>& cancel) {
    pipeline::JobOptions numerics;
    numerics.before_row = [&cancel](std::size_t, std::size_t, std::size_t) {
      if (cancel) throw Cancelled();
    };
    if (!out) {  // results only: no checkpoint, nothing written but the cache
      numerics.threads = workers;
      numerics.quiet = quiet;
      if (use_cache) numerics.cache_directory = cache ? cache : default_cache_directory();
      return Finished{pipeline::run_job(loaded.scenario, numerics), {}};
    }
    pipeline::RunSettings settings;
    settings.threads = workers;
    settings.quiet = quiet;
    settings.use_cache = use_cache;
    settings.cache_directory = cache;
    settings.foreign = adopt_folder ? ForeignFolder::adopt : ForeignFolder::refuse;
    const pipeline::ScenarioRun run = pipeline::run_scenario(loaded, *out, settings, numerics);
    // The plot data is written; drawing figures is the caller's (scripts/plot, or matplotlib here).
    const report::Written w = report::write_outputs(loaded, run.results, *out, {}, run.foreign);
    pipeline::discard_checkpoint(run);
    return Finished{run.results, w.files};
  });
  return results_dict(loaded, done);
}

}  // namespace

void add_run(py::module_& m) {
  m.def("run", &run, py::arg("scenario"), py::kw_only(), py::arg("output") = py::none(), py::arg("threads") = 0,
        py::arg("cache_dir") = py::none(), py::arg("use_cache") = true, py::arg("quiet") = true,
        py::arg("adopt_folder") = false,
        "Run a scenario: a scenario file's path, or a dict with the same keys. Returns a dict: N (expected decays "
        "in our past light cone per prescription), excluded and verdicts per prescription, curves (per "
        "prescription: mass_g, width, beta_max, f_max, band_low, band_high as numpy arrays, masked where there is "
        "no constraint), thresholds (per input of scan.thresholds: central, sigma, window, tolerance, "
        "critical_top_mass, and per prescription threshold, outruns_threshold, their notes and the evaluations "
        "value, N, max_decay_to_evaporation as arrays), failures, and summary (summary.json as a dict). With "
        "output=FOLDER the files of `ember "
        "run` are written there too (plot data, no figures). threads: 0 for every core. Ctrl-C stops the run.");
  m.def(
      "load_scenario",
      [](py::handle scenario) {
        const scenario::LoadedScenario l = load(scenario);
        return from_json_text(scenario::resolved_json(l.resolved).dump());
      },
      py::arg("scenario"), "Validate a scenario (file or dict) and return it with every default filled in.");
}

}  // namespace ember::python
