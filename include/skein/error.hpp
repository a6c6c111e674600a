// Skein: the error channels (architecture.md).
//  - bad input throws skein::InputError, which names file, line, column and what was expected;
//  - a numerical outcome (singular system, non-finite result) is a status in the run's summary (solver.hpp);
//  - a broken invariant aborts with file:line (SKEIN_ASSERT).
#pragma once

#include <stdexcept>
#include <string>

namespace skein {

/// A place in a source file; line and column are 1-based, 0 means "unknown".
struct SourceRegion {
  int line = 0;
  int column = 0;
};

/// `file:line:column: message`, leaving out the parts that are unknown (empty file, line or column 0): the
/// one format of every located message (InputError, and TrimError in trim.hpp).
std::string FormatSourceMessage(const std::string& file, const SourceRegion& where, const std::string& message);

/// Bad input: one sentence a user can act on. what() is the full line
/// `file:line:column: message` (parts that are unknown are left out).
class InputError : public std::runtime_error {
 public:
  InputError(std::string file, SourceRegion where, std::string message);
  explicit InputError(std::string message) : InputError("", {}, std::move(message)) {}

  const std::string& file() const { return file_; }
  const SourceRegion& where() const { return where_; }
  /// The message without the file:line:column prefix.
  const std::string& message() const { return message_; }

 private:
  std::string file_;
  SourceRegion where_;
  std::string message_;
};

/// A numerical failure the caller cannot fix by editing one value (singular system, non-finite result).
/// The library reports it as a status; the CLI turns it into one line and its own exit code.
class NumericalError : public std::runtime_error {
 public:
  using std::runtime_error::runtime_error;
};

[[noreturn]] void AssertionFailed(const char* expr, const char* file, int line);

}  // namespace skein

#define SKEIN_ASSERT(expr) ((expr) ? (void)0 : ::skein::AssertionFailed(#expr, __FILE__, __LINE__))
