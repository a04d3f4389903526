#pragma once
/// The one small exception family for bad input and bad usage (docs/style.md rule 7).
/// Expected endings of a simulation (cutoff, reserve crossed) are results, never exceptions.
#include <stdexcept>
#include <string>

namespace sortie {

/// A file, value or option that cannot be used; maps to exit code 1.
/// The message is one line: `FILE: /json/pointer: what is wrong (got X, expected Y)`.
class InputError : public std::runtime_error {
 public:
  explicit InputError(const std::string& what) : std::runtime_error(what) {}
};

/// A command line that cannot be understood; maps to exit code 2.
class UsageError : public std::runtime_error {
 public:
  explicit UsageError(const std::string& what) : std::runtime_error(what) {}
};

/// A computation that hit its work bound (step or iteration cap); maps to exit code 1.
class LimitError : public std::runtime_error {
 public:
  explicit LimitError(const std::string& what) : std::runtime_error(what) {}
};

/// Shortest round-trip text of a number, for messages ("got 0.5").
std::string format_number(double v);

}  // namespace sortie
