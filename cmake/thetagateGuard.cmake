# thetagate_guard_claims(<target> <folder>): the claim files a guarded test
# target reads. thetagate::guard::claim("sorting.toml", "...") with a relative
# file then reads it from <folder> (a relative <folder> is taken from the
# calling CMakeLists.txt's folder), whatever the working directory: ctest runs
# a test in the build tree, a maintainer from anywhere.
function(thetagate_guard_claims target folder)
  get_filename_component(folder "${folder}" ABSOLUTE BASE_DIR "${CMAKE_CURRENT_SOURCE_DIR}")
  target_compile_definitions(${target} PRIVATE "THETAGATE_CLAIMS_DIR=\"${folder}\"")
endfunction()
