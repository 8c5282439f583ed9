#include "core/sha256.h"

#include "testsupport.h"

#include <stdexcept>
#include <string>

namespace {

// Expected digests are the worked examples of FIPS PUB 180-2 (NIST, 2002), Appendix B:
// B.1 "abc", B.2 the 448-bit message, B.3 one million repetitions of 'a'.
constexpr const char *kAbc = "ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad";
constexpr const char *k448Bit = "248d6a61d20638b8e5c026930c3e6039a33ce45964ff2167f6ecedd419db06c1";
constexpr const char *kMillionA =
    "cdc76e5c9914fb9281a1c7e284d73e67f1809a48a497200e046d39ccc7112cd0";
constexpr const char *k448BitMessage = "abcdbcdecdefdefgefghfghighijhijkijkljklmklmnlmnomnopnopq";

TEST(Sha256, Fips180_2ExampleAbc) {
  EXPECT_EQ(cb::sha256Hex("abc"), kAbc); // FIPS 180-2 Appendix B.1
}

TEST(Sha256, Fips180_2Example448Bit) {
  EXPECT_EQ(cb::sha256Hex(k448BitMessage), k448Bit); // FIPS 180-2 Appendix B.2
}

TEST(Sha256, EmptyInput) {
  // No FIPS example for the empty message; value printed by GNU coreutils `sha256sum` for an
  // empty file (an independent implementation).
  EXPECT_EQ(cb::sha256Hex(""), "e3b0c44298fc1c149afbf4c8996fb92427ae41e4649b934ca495991b7852b855");
}

TEST(Sha256, StreamingInUnevenPiecesMatchesOneShot) {
  cb::Sha256 h;
  std::string_view msg = k448BitMessage;
  h.update(msg.substr(0, 1));
  h.update(msg.substr(1, 0));
  h.update(msg.substr(1, 30));
  h.update(msg.substr(31));
  EXPECT_EQ(h.hexDigest(), k448Bit); // FIPS 180-2 Appendix B.2
  // hexDigest() starts afresh, so the same object hashes the next message on its own.
  h.update("abc");
  EXPECT_EQ(h.hexDigest(), kAbc); // FIPS 180-2 Appendix B.1
}

TEST(Sha256, MillionAStreamedAndFromFile) {
  // 1,000,000 bytes span many 64 KiB read chunks and end mid-chunk.
  std::string million(1000000, 'a');
  cb::Sha256 h;
  for (std::size_t pos = 0; pos < million.size(); pos += 9973)
    h.update(std::string_view(million).substr(pos, 9973));
  EXPECT_EQ(h.hexDigest(), kMillionA); // FIPS 180-2 Appendix B.3

  cbtest::TempDir dir;
  cbtest::writeFile(dir / "a.txt", million);
  EXPECT_EQ(cb::sha256File(dir / "a.txt"), kMillionA); // FIPS 180-2 Appendix B.3
}

TEST(Sha256, FileOfAbc) {
  cbtest::TempDir dir;
  cbtest::writeFile(dir / "abc.txt", "abc");
  EXPECT_EQ(cb::sha256File(dir / "abc.txt"), kAbc); // FIPS 180-2 Appendix B.1
}

TEST(Sha256, MissingFileThrowsNamingIt) {
  cbtest::TempDir dir;
  try {
    cb::sha256File(dir / "absent.csv");
    FAIL() << "no exception";
  } catch (const std::runtime_error &e) {
    EXPECT_NE(std::string(e.what()).find("absent.csv"), std::string::npos) << e.what();
  }
}

} // namespace
