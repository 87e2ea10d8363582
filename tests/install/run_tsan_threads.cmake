# ctest driver (option PWB_TEST_TSAN): configure a ThreadSanitizer build of this source tree in
# WORK_DIR, build the C ABI tests there and run the thread tests under it. Any reported race
# fails the test (TSAN_OPTIONS halt_on_error=1).
#   cmake -DSOURCE_DIR=... -DWORK_DIR=... -P run_tsan_threads.cmake
include("${CMAKE_CURRENT_LIST_DIR}/script_common.cmake")
pwb_require_defined(run_tsan_threads.cmake SOURCE_DIR WORK_DIR)
set(PWB_RUN_ECHO ON)
run(${CMAKE_COMMAND} -S "${SOURCE_DIR}" -B "${WORK_DIR}" -DPWB_SANITIZE=thread -DPWB_TEST_TSAN=OFF
    -DCMAKE_BUILD_TYPE=RelWithDebInfo)
run(${CMAKE_COMMAND} --build "${WORK_DIR}" --target pwb_capi_tests -j2)
set(ENV{TSAN_OPTIONS} "halt_on_error=1 second_deadlock_stack=1")
run("${WORK_DIR}/tests/pwb_capi_tests" "[threads]")
