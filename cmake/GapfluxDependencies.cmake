# Every third-party library gapflux uses, from Debian's packages (see script/deps).
find_package(Eigen3 3.3 REQUIRED NO_MODULE)
find_package(tomlplusplus 3 REQUIRED)
find_package(HDF5 REQUIRED COMPONENTS C CXX)
find_package(VTK 9 REQUIRED COMPONENTS CommonCore CommonDataModel IOXML)
find_package(OpenMP REQUIRED COMPONENTS CXX)
find_package(fmt REQUIRED)
find_package(spdlog REQUIRED)
find_package(CLI11 CONFIG REQUIRED)

# SuiteSparse (CHOLMOD; UMFPACK for the complex time-harmonic systems) ships neither a CMake config nor a .pc file in Debian 12.
find_path(SUITESPARSE_INCLUDE_DIR cholmod.h PATH_SUFFIXES suitesparse REQUIRED)
find_library(CHOLMOD_LIBRARY cholmod REQUIRED)
find_library(UMFPACK_LIBRARY umfpack REQUIRED)
find_library(SUITESPARSECONFIG_LIBRARY suitesparseconfig REQUIRED)
add_library(gapflux_suitesparse INTERFACE IMPORTED)
target_include_directories(gapflux_suitesparse SYSTEM INTERFACE ${SUITESPARSE_INCLUDE_DIR})
target_link_libraries(gapflux_suitesparse INTERFACE ${CHOLMOD_LIBRARY} ${UMFPACK_LIBRARY}
                      ${SUITESPARSECONFIG_LIBRARY})

# Gmsh's C++ API: no CMake config or .pc file either.
find_path(GMSH_INCLUDE_DIR gmsh.h REQUIRED)
find_library(GMSH_LIBRARY gmsh REQUIRED)
add_library(gapflux_gmsh INTERFACE IMPORTED)
target_include_directories(gapflux_gmsh SYSTEM INTERFACE ${GMSH_INCLUDE_DIR})
target_link_libraries(gapflux_gmsh INTERFACE ${GMSH_LIBRARY})
find_package(nlohmann_json 3 REQUIRED)

# FFTW (double precision) through pkg-config.
find_package(PkgConfig REQUIRED)
pkg_check_modules(FFTW3 REQUIRED IMPORTED_TARGET fftw3)
