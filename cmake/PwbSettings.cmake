# Warnings and sanitizers applied to every powerback target, C or C++. The flags are those of
# GCC and Clang and are added only for those compilers (generator expressions per language).
set(_pwb_gnu_like "$<OR:$<COMPILE_LANG_AND_ID:CXX,GNU,Clang,AppleClang>,$<COMPILE_LANG_AND_ID:C,GNU,Clang,AppleClang>>")
function(pwb_apply_settings target)
  target_compile_options(${target} PRIVATE
    "$<${_pwb_gnu_like}:-Wall;-Wextra;-Wpedantic;-Wshadow>"
    "$<$<AND:${_pwb_gnu_like},$<BOOL:${PWB_WARNINGS_AS_ERRORS}>>:-Werror>"
    $<$<COMPILE_LANG_AND_ID:CXX,MSVC>:/W4>)
  pwb_apply_sanitizer(${target})
endfunction()

# Only the sanitizer flags: for programs that must link a sanitized library but keep their own
# warning flags.
function(pwb_apply_sanitizer target)
  if(PWB_SANITIZE)
    if(NOT CMAKE_CXX_COMPILER_ID MATCHES "GNU|Clang")
      message(FATAL_ERROR "PWB_SANITIZE needs GCC or Clang")
    endif()
    target_compile_options(${target} PRIVATE -fsanitize=${PWB_SANITIZE} -fno-omit-frame-pointer
                                             -fno-sanitize-recover=all)
    target_link_options(${target} PRIVATE -fsanitize=${PWB_SANITIZE})
  endif()
endfunction()
