#include "ember/evaporation/particles.hpp"

#include <fmt/format.h>
#include <yaml-cpp/yaml.h>

#include <algorithm>
#include <fstream>
#include <sstream>

#include "ember/core/data_files.hpp"
#include "ember/core/errors.hpp"
#include "ember/core/text.hpp"
#include "ember/units/quantity.hpp"

namespace ember::evaporation {

namespace {

struct Reader {
  std::string file;

  [[noreturn]] void fail(const YAML::Node& at, const std::string& key, const std::string& what,
                         const std::string& expected) const {
    const YAML::Mark m = at.Mark();
    throw InputError(fmt::format("{}:{}:{}: {}: {}; expected {}", file, m.is_null() ? 1 : m.line + 1,
                                 m.is_null() ? 1 : m.column + 1, key, what, expected));
  }

  std::string scalar(const YAML::Node& entry, const std::string& path, const char* key) const {
    const YAML::Node v = entry[key];
    if (!v) fail(entry, path + "." + key, "missing", "a value");
    if (!v.IsScalar()) fail(v, path + "." + key, "not a single value", "a value");
    return v.Scalar();
  }

  double number(const YAML::Node& entry, const std::string& path, const char* key) const {
    const auto x = parse_real(scalar(entry, path, key));
    if (!x) fail(entry[key], path + "." + key, fmt::format("\"{}\"", entry[key].Scalar()), "a finite number");
    return *x;
  }

  Species species(const YAML::Node& e, std::size_t index) const {
    const std::string path = fmt::format("species[{}]", index);
    if (!e.IsMap()) fail(e, path, "not a mapping", "{name, mass, spin, charge, colour, dof, window}");
    static const std::vector<std::string> keys{"name", "mass", "spin", "charge", "colour", "dof", "window"};
    for (auto it = e.begin(); it != e.end(); ++it) {
      const std::string k = it->first.Scalar();
      if (std::find(keys.begin(), keys.end(), k) == keys.end()) {
        const std::string near = closest_match(k, keys);
        fail(it->first, path + "." + k, "unknown key" + (near.empty() ? "" : " (did you mean \"" + near + "\"?)"),
             "one of " + join_alternatives(keys));
      }
    }
    Species s;
    s.name = scalar(e, path, "name");
    try {
      s.mass = units::parse_quantity(scalar(e, path, "mass"), units::mass, units::Sign::non_negative).value;
    } catch (const units::QuantityError& q) {
      fail(e["mass"], path + ".mass", q.problem(), q.expected());
    }
    const double spin = number(e, path, "spin");
    if (spin != 0 && spin != 0.5 && spin != 1 && spin != 2)
      fail(e["spin"], path + ".spin", fmt::format("{}", spin), "0, 0.5, 1 or 2");
    s.twice_spin = static_cast<int>(2 * spin);
    s.charge = number(e, path, "charge");
    const double colour = number(e, path, "colour");
    if (colour != 1 && colour != 3 && colour != 8)
      fail(e["colour"], path + ".colour", fmt::format("{}", colour), "1, 3 or 8");
    s.colour = static_cast<int>(colour);
    const auto dof = parse_whole(scalar(e, path, "dof"));
    if (!dof || *dof < 1 || *dof > 1000)
      fail(e["dof"], path + ".dof", e["dof"].Scalar(), "a whole number from 1 to 1000");
    s.dof = static_cast<int>(*dof);
    const std::string w = scalar(e, path, "window");
    if (w == "all")
      s.window = Window::all;
    else if (w == "partons")
      s.window = Window::partons;
    else if (w == "hadrons")
      s.window = Window::hadrons;
    else
      fail(e["window"], path + ".window", fmt::format("\"{}\"", w), "all, partons or hadrons");
    return s;
  }
};

}  // namespace

ParticleSet load_particles(const std::filesystem::path& file) {
  const Reader reader{file.string()};
  std::ifstream in(file);
  if (!in) throw InputError(fmt::format("{}: cannot be read; expected the particle table", file.string()));
  std::ostringstream text;
  text << in.rdbuf();
  YAML::Node doc;
  try {
    doc = YAML::Load(text.str());
  } catch (const YAML::ParserException& e) {
    throw InputError(fmt::format("{}:{}:{}: (document): YAML syntax error: {}; expected well-formed YAML",
                                 file.string(), e.mark.line + 1, e.mark.column + 1, e.msg));
  }
  if (!doc.IsMap() || !doc["species"] || !doc["species"].IsSequence())
    reader.fail(doc, "species", "missing or not a list", "a list of species under the key species");
  ParticleSet set;
  set.source = file.string();
  const YAML::Node list = doc["species"];
  for (std::size_t i = 0; i < list.size(); ++i) {
    Species s = reader.species(list[i], i);
    for (const auto& other : set.species)
      if (other.name == s.name)
        reader.fail(list[i]["name"], fmt::format("species[{}].name", i), "\"" + s.name + "\" given twice",
                    "unique names");
    set.species.push_back(std::move(s));
  }
  if (set.species.empty()) reader.fail(list, "species", "an empty list", "at least one species");
  return set;
}

ParticleSet load_default_particles() {
  return load_particles(data_file("particles.yaml"));
}

std::vector<std::string> ParticleSet::names() const {
  std::vector<std::string> out;
  for (const auto& s : species) out.push_back(s.name);
  return out;
}

ParticleSet ParticleSet::only(const std::vector<std::string>& wanted) const {
  const auto all = names();
  for (const auto& w : wanted)
    if (std::find(all.begin(), all.end(), w) == all.end()) {
      const std::string near = closest_match(w, all);
      throw InputError(fmt::format("species \"{}\": not in {}{}; expected one of {}", w, source,
                                   near.empty() ? "" : " (did you mean \"" + near + "\"?)", join_alternatives(all)));
    }
  ParticleSet out;
  out.source = source;
  for (const auto& s : species)
    if (std::find(wanted.begin(), wanted.end(), s.name) != wanted.end()) out.species.push_back(s);
  return out;
}

}  // namespace ember::evaporation
