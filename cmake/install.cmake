# `cmake --install BUILD --prefix P` lays out:
#   P/bin/ember (and ember-mpi)           P/lib/libember.so          P/include/ember/...
#   P/lib/cmake/Ember/                    the package: find_package(Ember CONFIG), Ember::ember
#   P/share/ember/data/                   the tables the library reads (core/data_files.hpp)
#   P/libexec/ember/plot                  scripts/plot, run by `ember run`
#   P/lib/python3/dist-packages/ember*.so the Python module, where it was built
# Every path inside is relative to P: the prefix can be moved.
include(CMakePackageConfigHelpers)
set(EMBER_CMAKE_DIR ${CMAKE_INSTALL_LIBDIR}/cmake/Ember)

install(TARGETS ember_lib EXPORT EmberTargets
  LIBRARY DESTINATION ${CMAKE_INSTALL_LIBDIR}
  INCLUDES DESTINATION ${CMAKE_INSTALL_INCLUDEDIR})
install(TARGETS ember RUNTIME DESTINATION ${CMAKE_INSTALL_BINDIR})
if(TARGET ember-mpi)
  install(TARGETS ember-mpi RUNTIME DESTINATION ${CMAKE_INSTALL_BINDIR})
endif()
# The library's headers; not the command line's (include/ember/cli), which is not installed.
install(DIRECTORY include/ember DESTINATION ${CMAKE_INSTALL_INCLUDEDIR}
  FILES_MATCHING PATTERN "*.hpp" PATTERN "cli" EXCLUDE)
install(FILES ${CMAKE_CURRENT_BINARY_DIR}/generated/ember/version.hpp DESTINATION ${CMAKE_INSTALL_INCLUDEDIR}/ember)
install(DIRECTORY data/ DESTINATION ${CMAKE_INSTALL_DATADIR}/ember/data)
install(PROGRAMS scripts/plot DESTINATION ${CMAKE_INSTALL_LIBEXECDIR}/ember)

install(EXPORT EmberTargets NAMESPACE Ember:: DESTINATION ${EMBER_CMAKE_DIR})
configure_package_config_file(cmake/EmberConfig.cmake.in ${CMAKE_CURRENT_BINARY_DIR}/EmberConfig.cmake
  INSTALL_DESTINATION ${EMBER_CMAKE_DIR} PATH_VARS CMAKE_INSTALL_DATADIR)
write_basic_package_version_file(${CMAKE_CURRENT_BINARY_DIR}/EmberConfigVersion.cmake COMPATIBILITY SameMinorVersion)
install(FILES ${CMAKE_CURRENT_BINARY_DIR}/EmberConfig.cmake ${CMAKE_CURRENT_BINARY_DIR}/EmberConfigVersion.cmake
  DESTINATION ${EMBER_CMAKE_DIR})
