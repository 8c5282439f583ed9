#include "core/finding.h"

#include <gtest/gtest.h>

TEST(Finding, PrintsFileLineColumn) {
  cb::Finding f{cb::Severity::Error, "res.csv", 7, 3, "booked_on \"x\" is not a date"};
  EXPECT_EQ(f.toString(), "res.csv:7:3: booked_on \"x\" is not a date");
  f.column = 0;
  EXPECT_EQ(f.toString(), "res.csv:7: booked_on \"x\" is not a date");
  f.line = 0;
  f.severity = cb::Severity::Warning;
  EXPECT_EQ(f.toString(), "res.csv: warning: booked_on \"x\" is not a date");
  cb::Finding noFile{cb::Severity::Info, "", 4, 2, "m"};
  EXPECT_EQ(noFile.toString(), "line 4:2: note: m");
}

TEST(Finding, HasErrorsOnlyForErrors) {
  cb::Findings fs{{cb::Severity::Warning, "a", 1, 1, "w"}, {cb::Severity::Info, "a", 1, 1, "i"}};
  EXPECT_FALSE(cb::hasErrors(fs));
  fs.push_back({cb::Severity::Error, "a", 2, 1, "e"});
  EXPECT_TRUE(cb::hasErrors(fs));
  EXPECT_STREQ(cb::severityName(cb::Severity::Warning), "warning");
}
