// Deflated temporary record file (spill.h). Records are [u32 size][bytes], gathered in a
// buffer of ~256 KiB and deflated at level 1: the fastest level keeps most of the gain on this
// text (measured on the 250 000-session bench store, bench/README.md) and keeps the audit's
// time dominated by the audit.
#include "audit/spill.h"

#include <cerrno>
#include <cstring>

#include "core/error.h"

namespace sp::audit {
namespace {

constexpr std::size_t kChunk = 256u << 10;

std::string io_message(const char* what) {
  return std::string("audit: ") + what + " a temporary file: " + std::strerror(errno);
}

}  // namespace

Spill::~Spill() {
  if (writing_) deflateEnd(&z_);
  if (reading_) inflateEnd(&z_);
  if (file_) std::fclose(file_);
}

void Spill::open() {
  file_ = std::tmpfile();
  if (!file_) throw Error(ExitCode::cant_create, io_message("cannot create"));
  if (deflateInit(&z_, 1) != Z_OK)
    throw Error(ExitCode::internal, "audit: zlib deflateInit failed");
  writing_ = true;
  buf_.resize(kChunk);
}

void Spill::deflate_some(int flush) {
  z_.next_in = reinterpret_cast<Bytef*>(pending_.data());
  z_.avail_in = static_cast<uInt>(pending_.size());
  int rc = Z_OK;
  do {
    z_.next_out = buf_.data();
    z_.avail_out = static_cast<uInt>(buf_.size());
    rc = deflate(&z_, flush);
    if (rc == Z_STREAM_ERROR) throw Error(ExitCode::internal, "audit: zlib deflate failed");
    const std::size_t n = buf_.size() - z_.avail_out;
    if (n > 0 && std::fwrite(buf_.data(), 1, n, file_) != n) {
      throw Error(ExitCode::io_error, io_message("cannot write"));
    }
    file_bytes_ += n;
  } while (flush == Z_FINISH ? rc != Z_STREAM_END : z_.avail_out == 0);
  pending_.clear();
}

void Spill::put(std::string_view record) {
  if (!file_) open();
  const auto size = static_cast<std::uint32_t>(record.size());
  char b[sizeof size];
  std::memcpy(b, &size, sizeof size);
  pending_.append(b, sizeof size);
  pending_.append(record);
  raw_bytes_ += sizeof size + record.size();
  ++records_;
  if (pending_.size() >= kChunk) deflate_some(Z_NO_FLUSH);
}

void Spill::fill(char* dst, std::size_t n) {
  z_.next_out = reinterpret_cast<Bytef*>(dst);
  z_.avail_out = static_cast<uInt>(n);
  while (z_.avail_out > 0) {
    if (z_.avail_in == 0) {
      const std::size_t got = std::fread(buf_.data(), 1, buf_.size(), file_);
      if (got == 0) throw Error(ExitCode::io_error, io_message("cannot read back"));
      z_.next_in = buf_.data();
      z_.avail_in = static_cast<uInt>(got);
    }
    const int rc = inflate(&z_, Z_NO_FLUSH);
    if (rc != Z_OK && !(rc == Z_STREAM_END && z_.avail_out == 0)) {
      throw Error(ExitCode::io_error, "audit: a temporary file does not read back (zlib)");
    }
  }
}

bool Spill::read(std::string& record) {
  if (read_ == records_) return false;
  if (!reading_) {
    deflate_some(Z_FINISH);
    deflateEnd(&z_);
    writing_ = false;
    if (std::fflush(file_) != 0 || std::fseek(file_, 0, SEEK_SET) != 0) {
      throw Error(ExitCode::io_error, io_message("cannot rewind"));
    }
    z_ = z_stream{};
    if (inflateInit(&z_) != Z_OK) throw Error(ExitCode::internal, "audit: zlib inflateInit failed");
    reading_ = true;
  }
  std::uint32_t size = 0;
  char b[sizeof size];
  fill(b, sizeof size);
  std::memcpy(&size, b, sizeof size);
  record.resize(size);
  if (size > 0) fill(record.data(), size);
  ++read_;
  return true;
}

void Spill::rewind() {
  if (!reading_) {
    read_ = 0;  // nothing read yet (read() starts from the first record)
    return;
  }
  inflateEnd(&z_);
  reading_ = false;
  if (std::fseek(file_, 0, SEEK_SET) != 0)
    throw Error(ExitCode::io_error, io_message("cannot rewind"));
  z_ = z_stream{};
  if (inflateInit(&z_) != Z_OK) throw Error(ExitCode::internal, "audit: zlib inflateInit failed");
  reading_ = true;
  read_ = 0;
}

}  // namespace sp::audit
