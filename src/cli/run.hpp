#pragma once
/// The command line: parse, dispatch to one command, map failures to exit codes.

namespace sortie::cli {

/// Exit codes (docs/architecture.md "Results and errors"): 0 done (and `fly` go), 3 `fly` no-go, 1 bad input,
/// 2 bad usage, 4 the command ran but the data do not support its result (`fit cell`: the quality
/// gate failed, no model written; `health`: the logs refused, no estimate).
inline constexpr int kExitOk = 0;
inline constexpr int kExitBadInput = 1;
inline constexpr int kExitUsage = 2;
inline constexpr int kExitNoGo = 3;
inline constexpr int kExitNoEstimate = 4;

int run(int argc, char** argv);

}  // namespace sortie::cli
