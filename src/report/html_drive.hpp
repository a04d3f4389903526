#pragma once
/// `sortie drive --html`: system, motor and ESC efficiency against throttle, one curve per bus
/// voltage or cell count (and the measured system efficiency of a bench map with torque), the
/// operating-point tables, the Cautions box.
#include <string>

#include "report/drive_report.hpp"

namespace sortie::report {

/// The plots the drive page draws with a drive model, by their data-plot id, in page order.
/// A bench map alone draws only the first, and only when it has a torque column.
inline constexpr const char* kDrivePlots[] = {"drive-eta-system", "drive-eta-motor", "drive-eta-esc"};

std::string drive_html(const DriveResult& r);

}  // namespace sortie::report
