# Installation of the C library as a package: the header, the shared library (with its SONAME),
# a CMake package (find_package(powerback) -> powerback::powerback) and a pkg-config file.
include(CMakePackageConfigHelpers)

set(PWB_CMAKE_PACKAGE_DIR "${CMAKE_INSTALL_LIBDIR}/cmake/powerback")

install(EXPORT powerbackTargets NAMESPACE powerback:: DESTINATION "${PWB_CMAKE_PACKAGE_DIR}")

configure_package_config_file("${CMAKE_CURRENT_LIST_DIR}/powerbackConfig.cmake.in"
  "${PROJECT_BINARY_DIR}/powerbackConfig.cmake" INSTALL_DESTINATION "${PWB_CMAKE_PACKAGE_DIR}")
# Before 1.0 a minor release may change the ABI, so only the same MAJOR.MINOR is compatible.
if(PROJECT_VERSION_MAJOR EQUAL 0)
  set(_pwb_compat SameMinorVersion)
else()
  set(_pwb_compat SameMajorVersion)
endif()
write_basic_package_version_file("${PROJECT_BINARY_DIR}/powerbackConfigVersion.cmake"
  VERSION ${PROJECT_VERSION} COMPATIBILITY ${_pwb_compat})
install(FILES "${PROJECT_BINARY_DIR}/powerbackConfig.cmake"
              "${PROJECT_BINARY_DIR}/powerbackConfigVersion.cmake"
        DESTINATION "${PWB_CMAKE_PACKAGE_DIR}")

# The .pc file finds the prefix from its own location, so an installed tree can be relocated.
file(RELATIVE_PATH PWB_PC_PREFIX_FROM_PCDIR "/pwb/${CMAKE_INSTALL_LIBDIR}/pkgconfig" "/pwb")
string(REGEX REPLACE "/$" "" PWB_PC_PREFIX_FROM_PCDIR "${PWB_PC_PREFIX_FROM_PCDIR}")
configure_file("${CMAKE_CURRENT_LIST_DIR}/powerback.pc.in" "${PROJECT_BINARY_DIR}/powerback.pc" @ONLY)
install(FILES "${PROJECT_BINARY_DIR}/powerback.pc" DESTINATION "${CMAKE_INSTALL_LIBDIR}/pkgconfig")
