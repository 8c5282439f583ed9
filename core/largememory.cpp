#include "core/largememory.h"

#include <cstdint>

#if defined(__linux__)
#include <sys/mman.h>
#endif

namespace cb {

void adviseHugePages(void *p, std::size_t bytes) noexcept {
#if defined(__linux__) && defined(MADV_HUGEPAGE)
  constexpr std::uintptr_t kHuge = std::uintptr_t{2} << 20;
  const auto begin = reinterpret_cast<std::uintptr_t>(p);
  const std::uintptr_t first = (begin + kHuge - 1) & ~(kHuge - 1);
  const std::uintptr_t last = (begin + bytes) & ~(kHuge - 1);
  if (p == nullptr || last <= first)
    return;
  // The result is ignored on purpose: a refusal only means 4 KB pages, as without the call.
  (void)::madvise(reinterpret_cast<void *>(first), last - first, MADV_HUGEPAGE);
#else
  (void)p;
  (void)bytes;
#endif
}

} // namespace cb
