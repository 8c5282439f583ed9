# One place for warning and sanitizer flags; every target calls curvebench_set_warnings().
function(curvebench_set_warnings target)
  target_compile_options(${target} PRIVATE -Wall -Wextra -Wpedantic -Wshadow -Wconversion
                                           -Wno-sign-conversion)
  if(CURVEBENCH_WERROR)
    target_compile_options(${target} PRIVATE -Werror)
  endif()
  if(CURVEBENCH_SANITIZE AND CMAKE_CXX_COMPILER_ID STREQUAL "GNU")
    # GCC 12 gives false -Wmaybe-uninitialized warnings inside libstdc++ (std::regex, std::optional)
    # once -fsanitize=address changes its optimisation; the plain build keeps the warning as an
    # error, so only this one warning is dropped here, and only in the sanitizer build.
    target_compile_options(${target} PRIVATE -Wno-maybe-uninitialized)
  endif()
endfunction()

if(CURVEBENCH_SANITIZE)
  add_compile_options(-fsanitize=address,undefined -fno-omit-frame-pointer -fno-sanitize-recover=undefined)
  add_link_options(-fsanitize=address,undefined)
endif()

# Strict Qt defines for ui/ and app/ (see DEVELOPERS.md).
function(curvebench_qt_defines target)
  target_compile_definitions(${target} PRIVATE QT_NO_CAST_FROM_ASCII QT_NO_FOREACH
                                               QT_DISABLE_DEPRECATED_BEFORE=0x060400)
endfunction()
