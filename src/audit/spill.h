// A temporary file of records written once, then read back once in order, deflated (zlib) on
// the way out: the streamed audit's findings are repetitive text (the same rules and
// sentences with other numbers), which deflate shrinks about tenfold.
// The file is unnamed (tmpfile: removed by the system when closed or when the process ends).
// Throws sp::Error: cant_create when no temporary file can be made, io_error when it cannot be
// written or read back (full disk, a corrupt read), internal on a zlib failure.
#pragma once
#include <zlib.h>

#include <cstdint>
#include <cstdio>
#include <string>
#include <string_view>
#include <vector>

namespace sp::audit {

class Spill {
 public:
  Spill() = default;
  ~Spill();
  Spill(const Spill&) = delete;
  Spill& operator=(const Spill&) = delete;

  // Appends one record. Only before the first read().
  void put(std::string_view record);
  // Records put.
  std::size_t records() const { return records_; }
  // Bytes of the file so far (compressed), and of the records before compression.
  std::uint64_t file_bytes() const { return file_bytes_; }
  std::uint64_t raw_bytes() const { return raw_bytes_; }
  // The next record in put() order into `record`; false after the last one.
  bool read(std::string& record);
  // Reads from the first record again (after reads; no more put()).
  void rewind();

 private:
  void open();
  void deflate_some(int flush);
  void fill(char* dst, std::size_t n);
  std::FILE* file_ = nullptr;
  z_stream z_{};
  bool writing_ = false, reading_ = false;
  std::size_t records_ = 0, read_ = 0;
  std::uint64_t file_bytes_ = 0, raw_bytes_ = 0;
  std::string pending_;             // records not yet handed to deflate
  std::vector<unsigned char> buf_;  // deflate's output / inflate's input
};

}  // namespace sp::audit
