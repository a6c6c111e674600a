// skein CLI: the `skein study` command (study_command.cpp). main.cpp only registers it.
#pragma once

#include <functional>

#include <CLI/CLI.hpp>

namespace skein::cli {

struct Command {
  CLI::App* app = nullptr;    ///< the subcommand, to test whether it was given
  std::function<int()> run;   ///< runs it after parsing; returns the exit code (errors are thrown, as elsewhere)
};

/// Registers `skein study CASE --vary PATH=FROM:TO:COUNT [--vary ...] (--cl X | --alpha DEG)` on `app`.
Command AddStudyCommand(CLI::App& app);

}  // namespace skein::cli
