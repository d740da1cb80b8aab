# The stepper catalogue (include/halfspin/propagation/stepper_catalogue.hpp) read by CMake, so
# that build lists (the footprint images) derive from it instead of keeping their own.
#
# halfspin_read_catalogue(<ids-var> <types-var> <names-var>): the catalogue's entries in order:
# stable ids, type names (halfspin::…), and run-time names (the snake_case of the type name, as
# tests/propagation/test_catalogue.cpp checks each stepper's `name` to be).
set(_halfspin_catalogue_file
    "${CMAKE_CURRENT_LIST_DIR}/../include/halfspin/propagation/stepper_catalogue.hpp")

function(halfspin_read_catalogue ids_var types_var names_var)
  file(READ "${_halfspin_catalogue_file}" text)
  string(REGEX MATCHALL "CatalogueEntry<[0-9]+, *[A-Za-z0-9_]+>" lines "${text}")
  set(ids "")
  set(types "")
  set(names "")
  foreach(line IN LISTS lines)
    string(REGEX MATCH "CatalogueEntry<([0-9]+), *([A-Za-z0-9_]+)>" m "${line}")
    list(APPEND ids "${CMAKE_MATCH_1}")
    set(type "${CMAKE_MATCH_2}")
    list(APPEND types "halfspin::${type}")
    string(REGEX REPLACE "([a-z0-9])([A-Z])" "\\1_\\2" name "${type}")
    string(REGEX REPLACE "([A-Za-z])([0-9])" "\\1_\\2" name "${name}")
    string(REGEX REPLACE "([0-9])([A-Za-z])" "\\1_\\2" name "${name}")
    string(TOLOWER "${name}" name)
    list(APPEND names "${name}")
  endforeach()
  if(NOT names)
    message(FATAL_ERROR "${_halfspin_catalogue_file}: no CatalogueEntry<id, Type> lines")
  endif()
  set(${ids_var} "${ids}" PARENT_SCOPE)
  set(${types_var} "${types}" PARENT_SCOPE)
  set(${names_var} "${names}" PARENT_SCOPE)
endfunction()
