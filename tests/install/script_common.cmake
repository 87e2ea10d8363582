# Shared by the ctest driver scripts of this folder (run with cmake -P): the check of their -D
# arguments and a command runner that stops the script when a command fails.

# Stops with a message naming `script` and the first of the variables after it not given as -D.
function(pwb_require_defined script)
  foreach(v ${ARGN})
    if(NOT DEFINED ${v})
      message(FATAL_ERROR "${script} needs -D${v}=...")
    endif()
  endforeach()
endfunction()

# Runs a command; when it fails, stops with its exit code, command line and output. Its standard
# output is left in run_out (and echoed when PWB_RUN_ECHO is set).
function(run)
  execute_process(COMMAND ${ARGN} RESULT_VARIABLE rc OUTPUT_VARIABLE out ERROR_VARIABLE err)
  if(NOT rc EQUAL 0)
    string(REPLACE ";" " " cmd "${ARGN}")
    message(FATAL_ERROR "failed (${rc}): ${cmd}\n${out}\n${err}")
  endif()
  if(PWB_RUN_ECHO)
    message(STATUS "${out}")
  endif()
  set(run_out "${out}" PARENT_SCOPE)
endfunction()
