# ctest's package_consumer: installs the build into a fresh prefix, then
# configures, builds and runs tests/consumer against it. Fails on any step.
#   cmake -DBUILD_DIR=... -DSOURCE_DIR=... -DWORK_DIR=... -DCXX_COMPILER=...
#         [-DCXX_LAUNCHER=...] [-DCXX_FLAGS=...] -P tests/consumer/run.cmake
include(${CMAKE_CURRENT_LIST_DIR}/../../cmake/staged_install.cmake NO_POLICY_SCOPE)
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
