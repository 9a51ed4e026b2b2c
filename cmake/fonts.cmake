# The report's three faces, cut down to WinAnsiEncoding at configure time (scripts/subset-font)
# and compiled into the binary as sp::embedded::font_files(). Why: libharu reads, copies and
# deflates every table of an embedded face; the full DejaVu faces made two thirds of a signed
# report's time, their WinAnsi subsets are a fifteenth of the size (bench/README.md). Text
# outside WinAnsi still draws with the full faces from fonts-dejavu-core at run time.
# Needs Debian's python3-fonttools (for /usr/bin/python3, hence the explicit interpreter).
set(SCALEPROOF_FONT_PYTHON "/usr/bin/python3" CACHE FILEPATH "Python 3 with fontTools (python3-fonttools)")
set(SCALEPROOF_FONT_SOURCE_DIR "/usr/share/fonts/truetype/dejavu" CACHE PATH "fonts-dejavu-core's folder")
execute_process(COMMAND "${SCALEPROOF_FONT_PYTHON}" -c "import fontTools"
                RESULT_VARIABLE _sp_fonttools OUTPUT_QUIET ERROR_QUIET)
if(NOT _sp_fonttools EQUAL 0)
  message(FATAL_ERROR "${SCALEPROOF_FONT_PYTHON} cannot import fontTools: install Debian's "
                      "python3-fonttools (scripts/setup-debian), or set SCALEPROOF_FONT_PYTHON")
endif()
set(_sp_font_out "${CMAKE_BINARY_DIR}/report-fonts")
file(MAKE_DIRECTORY "${_sp_font_out}")
foreach(face DejaVuSans DejaVuSans-Bold DejaVuSansMono)
  set(src "${SCALEPROOF_FONT_SOURCE_DIR}/${face}.ttf")
  if(NOT EXISTS "${src}")
    message(FATAL_ERROR "${src}: not found (Debian package fonts-dejavu-core)")
  endif()
  set_property(DIRECTORY APPEND PROPERTY CMAKE_CONFIGURE_DEPENDS "${src}"
               "${CMAKE_SOURCE_DIR}/scripts/subset-font")
  execute_process(COMMAND "${SCALEPROOF_FONT_PYTHON}" "${CMAKE_SOURCE_DIR}/scripts/subset-font"
                          "${src}" "${_sp_font_out}/${face}.ttf" "${face}-WinAnsi"
                  RESULT_VARIABLE rc ERROR_VARIABLE err)
  if(NOT rc EQUAL 0)
    message(FATAL_ERROR "subsetting ${src} failed: ${err}")
  endif()
endforeach()
scaleproof_embed(SCALEPROOF_EMBED_FONTS font_files "${_sp_font_out}" "*.ttf")
