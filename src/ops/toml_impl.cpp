// toml++'s compiled part (Debian's libtomlplusplus-dev headers), built once into the ops library
// instead of loading libtomlplusplus.so: one shared C++ library fewer to bind at every start
// (bench/README.md, "signed report"). This is toml++'s documented single-source mode
// (TOML_HEADER_ONLY=0 everywhere, TOML_IMPLEMENTATION in one source); ops/rig_file.cpp is its only
// user. Like nlohmann/json and CLI11, the parser is then compiled from the Debian headers
// into the binary.
#define TOML_IMPLEMENTATION
#include <toml++/toml.h>
