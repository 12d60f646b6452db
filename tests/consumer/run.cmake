# ctest's package_consumer: installs the build into a fresh prefix, then
# configures, builds and runs tests/consumer against it. Fails on any step.
#   cmake -DBUILD_DIR=... -DSOURCE_DIR=... -DWORK_DIR=... -DCXX_COMPILER=...
#         [-DCXX_LAUNCHER=...] [-DCXX_FLAGS=...] -P tests/consumer/run.cmake
foreach(var BUILD_DIR SOURCE_DIR WORK_DIR CXX_COMPILER)
  if(NOT DEFINED ${var})
    message(FATAL_ERROR "run.cmake needs -D${var}=...")
  endif()
endforeach()
file(REMOVE_RECURSE ${WORK_DIR})
set(prefix ${WORK_DIR}/prefix)

function(step what)
  execute_process(COMMAND ${ARGN} RESULT_VARIABLE status OUTPUT_VARIABLE out ERROR_VARIABLE out)
  if(NOT status EQUAL 0)
    message(FATAL_ERROR "${what} failed (${status}):\n${out}")
  endif()
  set(step_output "${out}" PARENT_SCOPE)
endfunction()

step("installing into ${prefix}" ${CMAKE_COMMAND} --install ${BUILD_DIR} --prefix ${prefix})
set(launcher)
if(CXX_LAUNCHER)
  set(launcher -DCMAKE_CXX_COMPILER_LAUNCHER=${CXX_LAUNCHER})
endif()
# A sanitizer build's library needs its consumers built with the same flags.
if(CXX_FLAGS)
  list(APPEND launcher "-DCMAKE_CXX_FLAGS=${CXX_FLAGS}")
endif()
# Only the staged prefix: not the build tree, not the source tree.
step("configuring the consumer" ${CMAKE_COMMAND} -S ${SOURCE_DIR}/tests/consumer
     -B ${WORK_DIR}/build -DCMAKE_PREFIX_PATH=${prefix} -DCMAKE_CXX_COMPILER=${CXX_COMPILER}
     ${launcher} -DTHETAGATE_README=${SOURCE_DIR}/README.md)
step("building the consumer" ${CMAKE_COMMAND} --build ${WORK_DIR}/build)
step("running the README snippet" ${WORK_DIR}/build/readme_snippet)
# The snippet prints the verdict of a claim that holds (merge sort's
# comparisons are Θ(n lg n): common practice).
if(NOT step_output MATCHES "^holds")
  message(FATAL_ERROR "the README snippet printed:\n${step_output}")
endif()
message(STATUS "the README snippet printed: ${step_output}")
