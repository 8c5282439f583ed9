#include "core/sha256.h"

#include <fmt/format.h>
#include <openssl/evp.h>

#include <array>
#include <cerrno>
#include <cstring>
#include <fstream>
#include <stdexcept>

namespace cb {

struct Sha256::Context {
  struct Free {
    void operator()(EVP_MD_CTX *c) const { EVP_MD_CTX_free(c); }
  };
  std::unique_ptr<EVP_MD_CTX, Free> md{EVP_MD_CTX_new()};

  void init() {
    if (!md || EVP_DigestInit_ex(md.get(), EVP_sha256(), nullptr) != 1)
      throw std::runtime_error("OpenSSL could not start a SHA-256 digest");
  }
};

Sha256::Sha256() : ctx_(std::make_unique<Context>()) { ctx_->init(); }
Sha256::~Sha256() = default;
Sha256::Sha256(Sha256 &&) noexcept = default;
Sha256 &Sha256::operator=(Sha256 &&) noexcept = default;

void Sha256::update(std::string_view bytes) {
  if (EVP_DigestUpdate(ctx_->md.get(), bytes.data(), bytes.size()) != 1)
    throw std::runtime_error("OpenSSL SHA-256 update failed");
}

std::string Sha256::hexDigest() {
  std::array<unsigned char, EVP_MAX_MD_SIZE> digest{};
  unsigned int size = 0;
  if (EVP_DigestFinal_ex(ctx_->md.get(), digest.data(), &size) != 1)
    throw std::runtime_error("OpenSSL SHA-256 finish failed");
  ctx_->init();
  static constexpr char hex[] = "0123456789abcdef";
  std::string out;
  out.reserve(2 * size);
  for (unsigned int i = 0; i < size; ++i) {
    out += hex[digest[i] >> 4];
    out += hex[digest[i] & 0x0f];
  }
  return out;
}

std::string sha256Hex(std::string_view bytes) {
  Sha256 h;
  h.update(bytes);
  return h.hexDigest();
}

std::string sha256File(const std::filesystem::path &path) {
  std::ifstream in(path, std::ios::binary);
  if (!in)
    throw std::runtime_error(
        fmt::format("cannot read {}: {}", path.string(), std::strerror(errno)));
  Sha256 h;
  std::array<char, 1 << 16> buffer{};
  while (in) {
    in.read(buffer.data(), static_cast<std::streamsize>(buffer.size()));
    h.update(std::string_view(buffer.data(), static_cast<std::size_t>(in.gcount())));
  }
  if (in.bad())
    throw std::runtime_error(fmt::format("error while reading {}", path.string()));
  return h.hexDigest();
}

} // namespace cb
