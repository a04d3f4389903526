# Each dependency comes from a Debian package; a missing one stops configure naming the package.
function(sortie_require found package_name what)
  if(NOT ${found})
    message(FATAL_ERROR "sortie needs ${what}: install the Debian package '${package_name}' "
                        "(apt-get install ${package_name}) and configure again.")
  endif()
endfunction()

find_package(Boost 1.74 QUIET)
sortie_require(Boost_FOUND libboost-dev "Boost (Odeint, Math)")
find_package(Eigen3 3.3 QUIET NO_MODULE)
sortie_require(Eigen3_FOUND libeigen3-dev "Eigen 3")
find_package(CLI11 QUIET CONFIG)
sortie_require(CLI11_FOUND libcli11-dev "CLI11")
find_package(nlohmann_json 3.10 QUIET CONFIG)
sortie_require(nlohmann_json_FOUND nlohmann-json3-dev "nlohmann-json")
# Geodesics (route legs, survey patterns) come from GeographicLib; they are not written here.
# Debian ships a find module (no config file) under /usr/share/cmake/geographiclib.
list(APPEND CMAKE_MODULE_PATH /usr/share/cmake/geographiclib)
find_package(GeographicLib QUIET)
sortie_require(GeographicLib_FOUND libgeographiclib-dev "GeographicLib (geodesics)")
# The pack logbook is an SQLite database (src/logbook/): transactions, locking and a file format
# documented and stable; CMake's FindSQLite3 module gives SQLite::SQLite3.
find_package(SQLite3 QUIET)
sortie_require(SQLite3_FOUND libsqlite3-dev "SQLite 3 (the pack logbook)")
if(SORTIE_BUILD_TESTS)
  find_package(doctest QUIET CONFIG)
  sortie_require(doctest_FOUND doctest-dev "doctest")
endif()

add_library(sortie_deps INTERFACE)
target_link_libraries(sortie_deps INTERFACE Boost::headers Eigen3::Eigen CLI11::CLI11 nlohmann_json::nlohmann_json
                      SQLite::SQLite3
                      ${GeographicLib_LIBRARIES})
target_include_directories(sortie_deps INTERFACE ${GeographicLib_INCLUDE_DIRS})
