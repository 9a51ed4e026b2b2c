// The invented demo scenario (data-demo/), compiled into the binary by cmake/demo.cmake so
// `scaleproof demo` works from any folder and from an installed copy.
// Contract as core/embedded.h: names relative to data-demo/ ("sessions/01-....json"), sorted;
// contents are the files' bytes. data-demo/demo.json is the manifest the demo follows.
#pragma once
#include <vector>

#include "core/embedded.h"

namespace sp::embedded {
const std::vector<File>& demo_files();
}  // namespace sp::embedded
