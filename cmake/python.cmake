# The Python module `ember` (src/python/, pybind11): built whenever pybind11 and Python's headers
# are found (Debian: pybind11-dev, python3-dev; numpy, python3-numpy, at run time only).
# Not in the sanitizer trees: an instrumented extension in an uninstrumented interpreter needs
# the sanitizer runtime preloaded, so there the Python tests are skipped (tests/CMakeLists.txt).
option(EMBER_PYTHON "Build the Python module when pybind11 and Python are found" ON)
set(EMBER_PYTHON_INSTALL_DIR "${CMAKE_INSTALL_LIBDIR}/python3/dist-packages"
    CACHE STRING "Where cmake --install puts the Python module, below the prefix")
if(EMBER_PYTHON AND (EMBER_SANITIZE OR EMBER_FUZZ))
  message(STATUS "python module: not built in a sanitizer tree")
elseif(EMBER_PYTHON)
  # The system interpreter, where Debian's python3-numpy is, before any other python3 on PATH.
  if(NOT DEFINED Python_EXECUTABLE AND EXISTS /usr/bin/python3)
    set(Python_EXECUTABLE /usr/bin/python3)
  endif()
  find_package(Python 3.9 COMPONENTS Interpreter Development.Module QUIET)
  if(Python_FOUND)
    set(PYBIND11_FINDPYTHON ON)
    find_package(pybind11 2.6 CONFIG QUIET)
  endif()
  if(pybind11_FOUND)
    pybind11_add_module(ember_python MODULE NO_EXTRAS
      src/python/module.cpp
      src/python/errors.cpp
      src/python/arrays.cpp
      src/python/greybody.cpp
      src/python/evaporation.cpp
      src/python/higgs.cpp
      src/python/bounce.cpp
      src/python/run.cpp)
    target_link_libraries(ember_python PRIVATE ember_lib ember_warnings)
    file(RELATIVE_PATH EMBER_PYTHON_TO_LIB ${CMAKE_INSTALL_PREFIX}/${EMBER_PYTHON_INSTALL_DIR} ${CMAKE_INSTALL_FULL_LIBDIR})
    # Each file opens the namespaces it binds (greybody, higgs, ...): compiled apart, not as one unit.
    set_target_properties(ember_python PROPERTIES OUTPUT_NAME ember
      LIBRARY_OUTPUT_DIRECTORY ${CMAKE_CURRENT_BINARY_DIR}/python
      UNITY_BUILD OFF
      INSTALL_RPATH "$ORIGIN/${EMBER_PYTHON_TO_LIB}")
    install(TARGETS ember_python LIBRARY DESTINATION ${EMBER_PYTHON_INSTALL_DIR})
    message(STATUS "python module: building for ${Python_EXECUTABLE} ${Python_VERSION}")
  else()
    message(STATUS "python module: pybind11 or Python's headers not found; not built")
  endif()
endif()
