# sortie_add_layer("name:dep1,dep2"): the static library sortie_<name> from src/<name>/*.cpp
# (the entry point src/cli/main.cpp excepted), linking the listed layers. A folder with no
# sources yet gives no target; layers that list it simply skip it. SORTIE_LAYER_TARGETS collects
# the targets made, lowest first.
set(SORTIE_WARNINGS -Wall -Wextra -Wpedantic
    # Model structs give every member a default; an aggregate initialiser that names the first
    # few and leaves the rest to their defaults is meant (-Wextra would flag it).
    -Wno-missing-field-initializers
    # gcc 12's -Wrestrict, -Wstringop-overflow, -Wstringop-overread and -Warray-bounds misfire
    # inside libstdc++'s std::string concatenation at -O2 (a memcpy of "9223372036854775809 or
    # more bytes" that cannot happen, GCC bug 105329); off for gcc before 13 only, so that real
    # warnings stand out.
    $<$<AND:$<CXX_COMPILER_ID:GNU>,$<VERSION_LESS:$<CXX_COMPILER_VERSION>,13>>:-Wno-restrict
      -Wno-stringop-overflow -Wno-stringop-overread -Wno-array-bounds>)
if(SORTIE_WERROR)
  list(APPEND SORTIE_WARNINGS -Werror)
endif()

# Precompiled headers per layer (-DSORTIE_PCH=OFF to build without): what most of its files
# include, directly or through our headers.
set(SORTIE_PCH_io <nlohmann/json.hpp> <string> <vector> <filesystem>)
set(SORTIE_PCH_report <nlohmann/json.hpp> <string> <vector> <sstream>)
set(SORTIE_PCH_cli <nlohmann/json.hpp> <CLI/CLI.hpp> <string> <vector>)
set(SORTIE_PCH_sim <vector> <string> <functional> <optional>)

set(SORTIE_LAYER_TARGETS "")
function(sortie_add_layer entry)
  string(REPLACE ":" ";" parts "${entry}")
  list(GET parts 0 name)
  list(LENGTH parts n)
  set(deps "")
  if(n GREATER 1)
    list(GET parts 1 dep_text)
    string(REPLACE "," ";" deps "${dep_text}")
  endif()
  file(GLOB sources CONFIGURE_DEPENDS ${PROJECT_SOURCE_DIR}/src/${name}/*.cpp)
  list(REMOVE_ITEM sources ${PROJECT_SOURCE_DIR}/src/cli/main.cpp)
  if(NOT sources)
    return()
  endif()
  add_library(sortie_${name} STATIC ${sources})
  target_include_directories(sortie_${name} PUBLIC ${PROJECT_SOURCE_DIR}/src)
  target_link_libraries(sortie_${name} PUBLIC sortie_deps)
  foreach(dep IN LISTS deps)
    if(TARGET sortie_${dep})
      target_link_libraries(sortie_${name} PUBLIC sortie_${dep})
    endif()
  endforeach()
  target_compile_options(sortie_${name} PRIVATE ${SORTIE_WARNINGS})
  # The heavy header libraries, parsed once per layer instead of once per file.
  if(SORTIE_PCH AND DEFINED SORTIE_PCH_${name})
    target_precompile_headers(sortie_${name} PRIVATE ${SORTIE_PCH_${name}})
  endif()
  set(SORTIE_LAYER_TARGETS ${SORTIE_LAYER_TARGETS} sortie_${name} PARENT_SCOPE)
endfunction()
