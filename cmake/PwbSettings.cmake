# Warnings and sanitizers applied to every powerback target.
function(pwb_apply_settings target)
  if(CMAKE_CXX_COMPILER_ID MATCHES "GNU|Clang")
    target_compile_options(${target} PRIVATE -Wall -Wextra -Wpedantic -Wshadow)
    if(PWB_WARNINGS_AS_ERRORS)
      target_compile_options(${target} PRIVATE -Werror)
    endif()
    if(PWB_SANITIZE)
      target_compile_options(${target} PRIVATE -fsanitize=${PWB_SANITIZE} -fno-omit-frame-pointer
                                               -fno-sanitize-recover=all)
      target_link_options(${target} PRIVATE -fsanitize=${PWB_SANITIZE})
    endif()
  endif()
endfunction()
