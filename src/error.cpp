// Skein: the error channels (error.hpp, architecture.md).
#include "skein/error.hpp"

#include <cstdio>
#include <cstdlib>
#include <string>
#include <utility>

namespace skein {
namespace {

// `file:line:column: message`, leaving out the parts that are unknown (empty file, line 0, column 0).
std::string FormatInputError(const std::string& file, const SourceRegion& where, const std::string& message) {
  std::string prefix = file;
  if (where.line > 0) {
    if (!prefix.empty()) prefix += ':';
    prefix += std::to_string(where.line);
    if (where.column > 0) prefix += ':' + std::to_string(where.column);
  }
  return prefix.empty() ? message : prefix + ": " + message;
}

}  // namespace

std::string FormatSourceMessage(const std::string& file, const SourceRegion& where, const std::string& message) {
  return FormatInputError(file, where, message);
}

InputError::InputError(std::string file, SourceRegion where, std::string message)
    : std::runtime_error(FormatInputError(file, where, message)),
      file_(std::move(file)),
      where_(where),
      message_(std::move(message)) {}

// The one place in the library that prints: a broken invariant cannot be reported through a return value.
void AssertionFailed(const char* expr, const char* file, int line) {
  std::fprintf(stderr, "skein: internal error: %s at %s:%d\n", expr, file, line);
  std::fflush(stderr);
  std::abort();
}

}  // namespace skein
