# ctest's orchard_guard_suite: installs thetagate into a fresh prefix, builds
# examples/orchard against it (find_package(thetagate), nothing else of the
# build or source tree), and runs its guard suite twice:
#   1. as is: every claim is guarded and the suite must pass, and so must the
#      README's guard snippet (built from the README);
#   2. with -DORCHARD_REGRESSION=ON: the merge sort re-compares an element it
#      already placed, and the suite must fail with a small witness input and
#      a replay command.
#   cmake -DBUILD_DIR=... -DSOURCE_DIR=... -DWORK_DIR=... -DCXX_COMPILER=...
#         [-DCXX_LAUNCHER=...] [-DCXX_FLAGS=...] -P examples/orchard/run.cmake
include(${CMAKE_CURRENT_LIST_DIR}/../../cmake/staged_install.cmake NO_POLICY_SCOPE)

foreach(variant ok regression)
  set(build ${WORK_DIR}/${variant})
  set(with_regression OFF)
  if(variant STREQUAL "regression")
    set(with_regression ON)
  endif()
  # Release without debug information: the two builds share every object
  # but one through the compiler cache.
  step("configuring orchard (${variant})" ${CMAKE_COMMAND} -S ${SOURCE_DIR}/examples/orchard
       -B ${build} ${consumer_args}
       -DCMAKE_BUILD_TYPE=Release -DORCHARD_REGRESSION=${with_regression})
  step("building orchard (${variant})" ${CMAKE_COMMAND} --build ${build} -j2)
  execute_process(COMMAND ${build}/orchard_guard_tests RESULT_VARIABLE status
                  OUTPUT_VARIABLE out ERROR_VARIABLE out)
  if(variant STREQUAL "ok")
    if(NOT status EQUAL 0)
      message(FATAL_ERROR "the orchard guard suite failed (${status}):\n${out}")
    endif()
    message(STATUS "the orchard guard suite passed")
    # The README's guard snippet, compiled from the README, passes too.
    execute_process(COMMAND ${build}/orchard_readme_guard RESULT_VARIABLE status
                    OUTPUT_VARIABLE out ERROR_VARIABLE out)
    if(NOT status EQUAL 0)
      message(FATAL_ERROR "the README's guard snippet failed (${status}):\n${out}")
    endif()
    message(STATUS "the README's guard snippet passed")
  else()
    # It must fail, in the sorting test only, with the witness of the
    # regression: three elements, one more comparison than T(3) = 3.
    if(status EQUAL 0)
      message(FATAL_ERROR "the suite passed with ORCHARD_REGRESSION=ON:\n${out}")
    endif()
    foreach(expected
        "[  FAILED  ] OrchardSort.StableSortKeepsItsComparisonClaim"
        "the code breaks its model 'orchard::stable_sort / comparisons, worst case'"
        "n = 3: counted cost 4 > T(n) = 3"
        "THETAGATE_GUARD_N=3"
        "1 FAILED TEST")
      string(FIND "${out}" "${expected}" at)
      if(at EQUAL -1)
        message(FATAL_ERROR "with ORCHARD_REGRESSION=ON the output lacks '${expected}':\n${out}")
      endif()
    endforeach()
    string(REGEX MATCH "input:  [^\n]*" input "${out}")
    message(STATUS "with ORCHARD_REGRESSION=ON the suite fails as it should; ${input}")
  endif()
endforeach()
