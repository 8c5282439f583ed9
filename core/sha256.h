// SHA-256 checksums of imported files (the import log records them), via OpenSSL's libcrypto.
#pragma once

#include <filesystem>
#include <memory>
#include <string>
#include <string_view>

namespace cb {

/// Incremental SHA-256, so an importer can hash a file while it streams through it.
/// Example: `Sha256 h; h.update("ab"); h.update("c"); h.hexDigest()` is the digest of "abc".
/// A moved-from object may only be destroyed or assigned to.
class Sha256 {
public:
  Sha256();
  ~Sha256();
  Sha256(Sha256 &&) noexcept;
  Sha256 &operator=(Sha256 &&) noexcept;
  Sha256(const Sha256 &) = delete;
  Sha256 &operator=(const Sha256 &) = delete;

  void update(std::string_view bytes);
  /// Lowercase hex digest of everything passed to update(); the object then starts afresh.
  std::string hexDigest();

private:
  struct Context;
  std::unique_ptr<Context> ctx_;
};

/// Lowercase hex SHA-256 of `bytes`.
std::string sha256Hex(std::string_view bytes);
/// Lowercase hex SHA-256 of a file's bytes, read in chunks (memory does not grow with the
/// file). Throws std::runtime_error naming the file if it cannot be read.
std::string sha256File(const std::filesystem::path &path);

} // namespace cb
