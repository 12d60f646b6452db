# Shared by the ctest scripts that build a separate project against this
# tree's package (tests/consumer/run.cmake, examples/orchard/run.cmake):
# checks their -D arguments, defines step(), installs the build into a fresh
# prefix under WORK_DIR, and sets `consumer_args`, the configure arguments
# that point a project at that prefix only (compiler, launcher, and the
# sanitizer flags a sanitized library needs in its consumers).
cmake_policy(SET CMP0054 NEW)  # if() compares quoted strings as strings
foreach(var BUILD_DIR SOURCE_DIR WORK_DIR CXX_COMPILER)
  if(NOT DEFINED ${var})
    message(FATAL_ERROR "${CMAKE_SCRIPT_MODE_FILE} needs -D${var}=...")
  endif()
endforeach()
file(REMOVE_RECURSE ${WORK_DIR})
set(prefix ${WORK_DIR}/prefix)

# Runs a command; fails the script with its output unless it exits 0. The
# output is left in `step_output`.
function(step what)
  execute_process(COMMAND ${ARGN} RESULT_VARIABLE status OUTPUT_VARIABLE out ERROR_VARIABLE out)
  if(NOT status EQUAL 0)
    message(FATAL_ERROR "${what} failed (${status}):\n${out}")
  endif()
  set(step_output "${out}" PARENT_SCOPE)
endfunction()

step("installing into ${prefix}" ${CMAKE_COMMAND} --install ${BUILD_DIR} --prefix ${prefix})
# Only the staged prefix: not the build tree, not the source tree.
set(consumer_args -DCMAKE_PREFIX_PATH=${prefix} -DCMAKE_CXX_COMPILER=${CXX_COMPILER})
if(CXX_LAUNCHER)
  list(APPEND consumer_args -DCMAKE_CXX_COMPILER_LAUNCHER=${CXX_LAUNCHER})
endif()
if(CXX_FLAGS)
  list(APPEND consumer_args "-DCMAKE_CXX_FLAGS=${CXX_FLAGS}")
endif()
