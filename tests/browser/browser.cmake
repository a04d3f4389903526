# The browser check (ctest -L browser): the demo mission's HTML report rendered by headless
# Chromium, its screenshot read back by png_check. Page and screenshot are kept under
# <build>/tests/artifacts/. Skipped (not passed) when Chromium is missing.
add_executable(png_check ${CMAKE_CURRENT_LIST_DIR}/png_check.cpp)
target_include_directories(png_check PRIVATE ${CMAKE_CURRENT_SOURCE_DIR})
target_compile_options(png_check PRIVATE -Wall -Wextra -Wpedantic)
add_test(NAME browser_render_fly_report
         COMMAND bash ${CMAKE_CURRENT_LIST_DIR}/render_fly.sh $<TARGET_FILE:sortie> $<TARGET_FILE:png_check>
                 ${PROJECT_SOURCE_DIR} ${PROJECT_BINARY_DIR}/tests/artifacts)
set_tests_properties(browser_render_fly_report PROPERTIES LABELS browser SKIP_RETURN_CODE 77 TIMEOUT 180)
