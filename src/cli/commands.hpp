#pragma once
/// One registration function per command; each lives in its own file (cli/<command>.cpp).
/// A command's callback runs after parsing and returns the exit code through `exit_code`.
#include <CLI/CLI.hpp>

namespace sortie::cli {

void add_discharge_command(CLI::App& app, int& exit_code);
void add_fit_command(CLI::App& app, int& exit_code);
void add_drive_command(CLI::App& app, int& exit_code);
void add_fly_command(CLI::App& app, int& exit_code);
void add_compare_command(CLI::App& app, int& exit_code);
void add_route_command(CLI::App& app, int& exit_code);
void add_check_command(CLI::App& app, int& exit_code);
void add_health_command(CLI::App& app, int& exit_code);
void add_remaining_command(CLI::App& app, int& exit_code);
void add_logbook_command(CLI::App& app, int& exit_code);

}  // namespace sortie::cli
