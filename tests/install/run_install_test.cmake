# ctest driver: install the build tree into a fresh prefix under the build directory, check
# what landed there (header, shared library with its SONAME, CMake package, pkg-config file),
# then build and run tests/install/consumer.c against it twice: once through
# find_package(powerback), once through pkg-config.
#   cmake -DBUILD_DIR=... -DWORK_DIR=... -DSOURCE_DIR=... -DC_COMPILER=... -DSOVERSION=... -P run_install_test.cmake
include("${CMAKE_CURRENT_LIST_DIR}/script_common.cmake")
pwb_require_defined(run_install_test.cmake BUILD_DIR WORK_DIR SOURCE_DIR C_COMPILER SOVERSION)

set(prefix "${WORK_DIR}/prefix")
file(REMOVE_RECURSE "${WORK_DIR}")
file(MAKE_DIRECTORY "${WORK_DIR}")
run(${CMAKE_COMMAND} --install "${BUILD_DIR}" --prefix "${prefix}")

# What must be installed. The library directory is lib or lib64 or a multiarch directory.
file(GLOB_RECURSE pcs "${prefix}/*/powerback.pc")
file(GLOB_RECURSE configs "${prefix}/*/powerbackConfig.cmake")
file(GLOB_RECURSE sonames "${prefix}/*/libpowerback.so.${SOVERSION}")
if(NOT EXISTS "${prefix}/include/powerback.h")
  message(FATAL_ERROR "powerback.h not installed under ${prefix}/include")
endif()
foreach(v pcs configs sonames)
  list(LENGTH ${v} k)
  if(NOT k EQUAL 1)
    message(FATAL_ERROR "expected one installed file for ${v}, found: ${${v}}")
  endif()
endforeach()
find_program(READELF readelf REQUIRED)
run(${READELF} -d "${sonames}")
if(NOT run_out MATCHES "Library soname: \\[libpowerback\\.so\\.${SOVERSION}\\]")
  message(FATAL_ERROR "the installed library has no SONAME libpowerback.so.${SOVERSION}:\n${run_out}")
endif()
get_filename_component(libdir "${sonames}" DIRECTORY)

# 1. The CMake package.
run(${CMAKE_COMMAND} -S "${SOURCE_DIR}/cmake_consumer" -B "${WORK_DIR}/cmake_consumer"
    "-DCMAKE_PREFIX_PATH=${prefix}" "-DCMAKE_C_COMPILER=${C_COMPILER}")
run(${CMAKE_COMMAND} --build "${WORK_DIR}/cmake_consumer")
run("${WORK_DIR}/cmake_consumer/consumer")
message(STATUS "find_package: ${run_out}")

# 2. pkg-config; the .pc file finds the prefix from its own location.
find_program(PKG_CONFIG pkg-config REQUIRED)
get_filename_component(pcdir "${pcs}" DIRECTORY)
set(ENV{PKG_CONFIG_PATH} "${pcdir}")
run(${PKG_CONFIG} --cflags powerback)
string(STRIP "${run_out}" cflags)
run(${PKG_CONFIG} --libs powerback)
string(STRIP "${run_out}" libs)
run(${PKG_CONFIG} --modversion powerback)
string(STRIP "${run_out}" modversion)
separate_arguments(cflags UNIX_COMMAND "${cflags}")
separate_arguments(libs UNIX_COMMAND "${libs}")
run(${C_COMPILER} -std=c99 -Wall -Wextra -pedantic -Werror ${cflags}
    "${SOURCE_DIR}/consumer.c" -o "${WORK_DIR}/pc_consumer" ${libs} "-Wl,-rpath,${libdir}")
run("${WORK_DIR}/pc_consumer")
message(STATUS "pkg-config (${modversion}): ${run_out}")
if(NOT run_out MATCHES "powerback ${modversion}")
  message(FATAL_ERROR "pkg-config reports version ${modversion}, the library says: ${run_out}")
endif()
