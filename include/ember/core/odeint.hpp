// Boost.Odeint, included once for every module. GCC 12 reports -Wuninitialized and
// -Wmaybe-uninitialized inside odeint's steppers when the state is a std::array (the members are
// copied before their first write; harmless). The warnings are silenced for odeint's own lines
// only: the pragmas are location-based, so our code keeps every warning.
#pragma once

#if defined(__GNUC__) && !defined(__clang__)
#pragma GCC diagnostic push
#pragma GCC diagnostic ignored "-Wuninitialized"
#pragma GCC diagnostic ignored "-Wmaybe-uninitialized"
#endif
#include <boost/numeric/odeint.hpp>
#if defined(__GNUC__) && !defined(__clang__)
#pragma GCC diagnostic pop
#endif
