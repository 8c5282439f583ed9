// Vectors of a million records (1M reservations are 232 MB): on Linux, their memory in 2 MB pages
// instead of 4 KB ones. Measured with perf at a million reservations: the page faults of filling
// the vector with 4 KB pages were the largest single cost of loading the store.
#pragma once

#include <cstddef>
#include <vector>

namespace cb {

/// Asks the kernel to back the 2 MB-aligned part of [p, p + bytes) with transparent huge pages
/// (madvise MADV_HUGEPAGE) before it is first touched. Only a hint: nothing happens where the
/// system has no such pages or refuses, and the memory behaves the same either way.
void adviseHugePages(void *p, std::size_t bytes) noexcept;

/// v.reserve(n), with the new buffer advised as above (when it is large enough to matter).
template <class T> void reserveLarge(std::vector<T> &v, std::size_t n) {
  v.reserve(n);
  adviseHugePages(v.data(), v.capacity() * sizeof(T));
}

} // namespace cb
