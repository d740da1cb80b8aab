# The API reference (option HALFSPIN_BUILD_DOCS, preset docs): Doxygen over include/halfspin with
# docs/Doxyfile.in, HTML into <build>/docs/html. Doxygen's WARN_AS_ERROR = FAIL_ON_WARNINGS makes
# the target fail on any warning, so an undocumented public declaration or a malformed doc comment
# fails the build (halfspin::detail is excluded: it is not public API).
find_package(Doxygen REQUIRED)
set(HALFSPIN_DOCS_OUTPUT "${CMAKE_CURRENT_BINARY_DIR}/docs")
configure_file("${CMAKE_CURRENT_SOURCE_DIR}/docs/Doxyfile.in" "${HALFSPIN_DOCS_OUTPUT}/Doxyfile" @ONLY)
file(GLOB_RECURSE _halfspin_docs_headers CONFIGURE_DEPENDS
  "${CMAKE_CURRENT_SOURCE_DIR}/include/halfspin/*.hpp")
add_custom_command(
  OUTPUT "${HALFSPIN_DOCS_OUTPUT}/html/index.html"
  COMMAND "${CMAKE_COMMAND}" -E rm -rf "${HALFSPIN_DOCS_OUTPUT}/html"
  COMMAND Doxygen::doxygen "${HALFSPIN_DOCS_OUTPUT}/Doxyfile"
  DEPENDS "${HALFSPIN_DOCS_OUTPUT}/Doxyfile" "${CMAKE_CURRENT_SOURCE_DIR}/docs/api-mainpage.md"
          "${CMAKE_CURRENT_SOURCE_DIR}/docs/api-namespaces.dox" ${_halfspin_docs_headers}
  WORKING_DIRECTORY "${CMAKE_CURRENT_SOURCE_DIR}"
  COMMENT "Doxygen: the API reference, any warning fails (${HALFSPIN_DOCS_OUTPUT}/html/index.html)"
  VERBATIM)
add_custom_target(halfspin_docs ALL DEPENDS "${HALFSPIN_DOCS_OUTPUT}/html/index.html")
