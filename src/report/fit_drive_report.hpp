#pragma once
/// The results of `sortie fit drive`: a text report and a JSON report — fitted parameters with
/// their standard errors, and every bench step beside what the written drive gives there
/// (residuals, efficiency or g/W against throttle).
#include <nlohmann/json.hpp>
#include <string>

#include "fit/fit_drive.hpp"

namespace sortie::report {

/// JSON report schema version.
inline constexpr const char* kFitDriveSchema = "sortie.fit_drive/1";

std::string fit_drive_text(const std::string& bench_file, const fit::DriveFitResult& r,
                           const std::string& model_file);
nlohmann::ordered_json fit_drive_json(const std::string& bench_file, const fit::DriveFitResult& r,
                                      const std::string& model_file);

}  // namespace sortie::report
