#include "core/jsonlocate.h"

#include <gtest/gtest.h>

namespace {

using Pos = std::pair<std::int64_t, int>;

const char *kProfile = R"({
  "version": 1,
  "fields": {
    "status": { "column": "state", "values": { "Ok": "confirmed" } },
    "rate": { "colum": "price" }
  },
  "rate": 3
})";

} // namespace

TEST(JsonLocate, FindsTheKeyAtItsPathNotASameNamedKeyElsewhere) {
  EXPECT_EQ(cb::jsonKeyPosition(kProfile, {"fields", "rate", "colum"}), (Pos{5, 15}));
  EXPECT_EQ(cb::jsonKeyPosition(kProfile, {"fields", "rate"}), (Pos{5, 5}));
  EXPECT_EQ(cb::jsonKeyPosition(kProfile, {"rate"}), (Pos{7, 3})); // the top-level one
  EXPECT_EQ(cb::jsonKeyPosition(kProfile, {"fields", "status", "values", "Ok"}), (Pos{4, 48}));
  // A string value is not a key, however it reads.
  EXPECT_EQ(cb::jsonKeyPosition(kProfile, {"fields", "status", "column", "state"}), (Pos{4, 17}));
}

TEST(JsonLocate, FallsBackToTheDeepestPartFound) {
  EXPECT_EQ(cb::jsonKeyPosition(kProfile, {"fields", "segment"}), (Pos{3, 3}));
  EXPECT_EQ(cb::jsonKeyPosition(kProfile, {"nothing"}), (Pos{0, 0}));
  EXPECT_EQ(cb::jsonKeyPosition(kProfile, {}), (Pos{0, 0}));
  EXPECT_EQ(cb::jsonKeyPosition("", {"fields"}), (Pos{0, 0}));
  // Columns count characters, not bytes.
  EXPECT_EQ(cb::jsonKeyPosition("{\"é\": 1, \"x\": 2}", {"x"}), (Pos{1, 10}));
}

TEST(JsonLocate, ReadsTheKeyPathOfProfileMessages) {
  using V = std::vector<std::string>;
  EXPECT_EQ(cb::profileKeyPath("unknown key \"colum\" in fields.rate (allowed: column)"),
            (V{"fields", "rate", "colum"}));
  EXPECT_EQ(cb::profileKeyPath("unknown key \"guest\" in fields (native fields: a, b)"),
            (V{"fields", "guest"}));
  EXPECT_EQ(cb::profileKeyPath("unknown key \"x\" in the profile (allowed: version)"), (V{"x"}));
  EXPECT_EQ(cb::profileKeyPath("fields.booked_on.date_format \"%Y\" must use %d"),
            (V{"fields", "booked_on", "date_format"}));
  EXPECT_EQ(cb::profileKeyPath("fields.cutoff: \"colunm\" is not allowed here (column)"),
            (V{"fields", "cutoff", "colunm"}));
  EXPECT_EQ(cb::profileKeyPath("\"group_size\" is not a block field"), (V{"fields", "group_size"}));
  EXPECT_EQ(cb::profileKeyPath("\"kind\" must be \"blocks\""), (V{"kind"}));
  EXPECT_EQ(cb::profileKeyPath("delimiter \";;\" must be one character"), (V{"delimiter"}));
  EXPECT_EQ(cb::profileKeyPath("this program reads mapping profiles of \"version\": 1"),
            (V{"version"}));
  EXPECT_EQ(cb::profileKeyPath("the profile is not valid JSON"), V{});
}
