# ctest driver: configure, build and run tests/install/subdir_consumer, a parent project that
# includes powerback with add_subdirectory.
#   cmake -DSOURCE_DIR=<powerback source> -DWORK_DIR=... -DC_COMPILER=... -DCXX_COMPILER=...
#         [-DLAUNCHER=ccache] -P run_subdir_test.cmake
include("${CMAKE_CURRENT_LIST_DIR}/script_common.cmake")
pwb_require_defined(run_subdir_test.cmake SOURCE_DIR WORK_DIR C_COMPILER CXX_COMPILER)

file(REMOVE_RECURSE "${WORK_DIR}")
set(launch "")
if(LAUNCHER)
  set(launch "-DCMAKE_CXX_COMPILER_LAUNCHER=${LAUNCHER}" "-DCMAKE_C_COMPILER_LAUNCHER=${LAUNCHER}")
endif()
# An empty CMAKE_BUILD_TYPE in the environment would be read as the default; make sure none is.
unset(ENV{CMAKE_BUILD_TYPE})
run(${CMAKE_COMMAND} -S "${SOURCE_DIR}/tests/install/subdir_consumer" -B "${WORK_DIR}"
    "-DPWB_SOURCE_DIR=${SOURCE_DIR}" "-DCMAKE_C_COMPILER=${C_COMPILER}"
    "-DCMAKE_CXX_COMPILER=${CXX_COMPILER}" ${launch})
include(ProcessorCount)
ProcessorCount(jobs)
if(jobs EQUAL 0)
  set(jobs 2)
endif()
run(${CMAKE_COMMAND} --build "${WORK_DIR}" -j ${jobs} --target consumer core_consumer)
run("${WORK_DIR}/consumer")
message(STATUS "C consumer: ${run_out}")
run("${WORK_DIR}/core_consumer")
message(STATUS "C++ consumer: ${run_out}")
