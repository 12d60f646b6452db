# ctest's package_consumer: installs the build into a fresh prefix, then
# configures, builds and runs tests/consumer against it. Fails on any step.
#   cmake -DBUILD_DIR=... -DSOURCE_DIR=... -DWORK_DIR=... -DCXX_COMPILER=...
#         [-DCXX_LAUNCHER=...] [-DCXX_FLAGS=...] -P tests/consumer/run.cmake
include(${CMAKE_CURRENT_LIST_DIR}/../../cmake/staged_install.cmake NO_POLICY_SCOPE)
# The package carries its licence and a pkg-config file for builds without CMake.
file(GLOB_RECURSE licence ${prefix}/share/doc/*/LICENSE)
if(NOT licence)
  message(FATAL_ERROR "the install has no LICENSE under share/doc")
endif()
file(GLOB_RECURSE pc_file ${prefix}/*/pkgconfig/thetagate.pc)
if(NOT pc_file)
  message(FATAL_ERROR "the install has no pkgconfig/thetagate.pc")
endif()
find_program(PKG_CONFIG pkg-config)
if(PKG_CONFIG)
  get_filename_component(pc_dir ${pc_file} DIRECTORY)
  set(ENV{PKG_CONFIG_PATH} ${pc_dir})
  step("asking pkg-config" ${PKG_CONFIG} --cflags --libs thetagate)
  file(REAL_PATH ${prefix}/include real_include)
  string(REGEX MATCH "-I([^ \n]+)" include_flag "${step_output}")
  if(include_flag)
    file(REAL_PATH "${CMAKE_MATCH_1}" pc_include)
  endif()
  if(NOT step_output MATCHES "-lthetagate" OR NOT pc_include STREQUAL real_include)
    message(FATAL_ERROR "pkg-config --cflags --libs thetagate printed: ${step_output}")
  endif()
endif()
step("configuring the consumer" ${CMAKE_COMMAND} -S ${SOURCE_DIR}/tests/consumer
     -B ${WORK_DIR}/build ${consumer_args} -DTHETAGATE_README=${SOURCE_DIR}/README.md)
step("building the consumer" ${CMAKE_COMMAND} --build ${WORK_DIR}/build)
step("running the README snippet" ${WORK_DIR}/build/readme_snippet)
# The snippet prints the verdict of a claim that holds (merge sort's
# comparisons are Θ(n lg n): common practice).
if(NOT step_output MATCHES "^holds")
  message(FATAL_ERROR "the README snippet printed:\n${step_output}")
endif()
message(STATUS "the README snippet printed: ${step_output}")
