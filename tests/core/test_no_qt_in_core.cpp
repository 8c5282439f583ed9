// core/ must never depend on Qt (DEVELOPERS.md, dependency rule): scan every core source.
#include "testsupport.h"

#include <fstream>
#include <regex>

TEST(Architecture, NoCoreFileIncludesQt) {
  const std::regex qtInclude(R"(^\s*#\s*include\s*[<"](Q[A-Za-z]|qt|qcustomplot))");
  int scanned = 0;
  for (const auto &entry :
       std::filesystem::recursive_directory_iterator(cbtest::sourceDir() / "core")) {
    auto ext = entry.path().extension();
    if (ext != ".h" && ext != ".cpp")
      continue;
    ++scanned;
    std::ifstream in(entry.path());
    std::string line;
    int n = 0;
    while (std::getline(in, line)) {
      ++n;
      EXPECT_FALSE(std::regex_search(line, qtInclude))
          << entry.path().string() << ":" << n << ": core includes Qt: " << line;
    }
  }
  EXPECT_GT(scanned, 10) << "did not find the core sources";
}

TEST(Architecture, CoreCMakeLinksNoQt) {
  std::string cmake = cbtest::readFile(cbtest::sourceDir() / "core" / "CMakeLists.txt");
  ASSERT_FALSE(cmake.empty());
  EXPECT_EQ(cmake.find("Qt6::"), std::string::npos);
  EXPECT_EQ(cmake.find("Qt5::"), std::string::npos);
}
