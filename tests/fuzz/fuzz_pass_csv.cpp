// Fuzz target: the CSV-of-passes parser (format/pass_csv.h), the pure parse path of `import`.
// Properties: no crash; bad input -> sp::Error(65) naming the file; every row that parses is
// written back (write_pass_csv_row) to a row that parses again and writes out identically.
#include <sstream>

#include "format/pass_csv.h"
#include "fuzz_common.h"

namespace sp::fuzz {

inline std::string csv_round_trip(const CsvPassRow& row) {
  std::string text = sp::pass_csv_header();
  sp::write_pass_csv_row(text, row);
  return text;
}

inline int pass_csv_one(const uint8_t* data, size_t size) {
  static const std::string kSource = "fuzz.csv";
  std::istringstream in{std::string(as_text(data, size))};
  std::vector<std::string> written;
  try {
    sp::PassCsvReader reader(in, kSource);
    sp::CsvPassRow row;
    while (reader.next(row)) {
      if (written.size() < 64) written.push_back(csv_round_trip(row));
    }
  } catch (const sp::Error& e) {
    check_data_error(e, kSource);
    return 0;
  }
  for (const std::string& once : written) {
    std::istringstream again(once);
    std::string twice;
    try {
      sp::PassCsvReader reader(again, kSource);
      sp::CsvPassRow row;
      if (!reader.next(row)) violated("written row vanished", once);
      twice = csv_round_trip(row);
    } catch (const sp::Error& e) {
      violated("written row does not parse again", std::string(e.what()) + "\n" + once);
    }
    if (twice != once) violated("round trip is not lossless", once + "---\n" + twice);
  }
  return 0;
}

}  // namespace sp::fuzz

SP_FUZZ_ENTRY(sp::fuzz::pass_csv_one)
