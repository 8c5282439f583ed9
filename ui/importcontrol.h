// The cancel flag and progress of a background import, shared between the UI and the worker.
#pragma once

#include <atomic>
#include <cstdint>

namespace cbui {

/// Cancel flag and progress of a background import (shared with the worker).
struct ImportControl {
  std::atomic<bool> cancel{false};
  std::atomic<std::int64_t> done{0}, total{0};
};

} // namespace cbui
