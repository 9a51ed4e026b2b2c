// Station key files on disk: NAME.key (private, PEM PKCS#8, mode 0600) and NAME.pub.pem.
//
// create_key_files refuses to overwrite: it creates both files with O_CREAT|O_EXCL and throws
// sp::Error(cant_create) naming the file if either exists or cannot be made; on any failure it
// removes what it created, so no half pair is left behind. Private keys never go into the store.
#pragma once
#include <string>
#include <vector>

namespace sp::report {

struct KeyFiles {
  std::string private_path;  // NAME.key
  std::string public_path;   // NAME.pub.pem
  std::string fingerprint;   // see signer.h
};

// NAME may carry a folder ("keys/station-3"); a trailing ".key" is dropped.
KeyFiles key_file_names(const std::string& name);
KeyFiles create_key_files(const std::string& name);

// Whole-file reads for keys, records and reports; throws no_input / io_error naming the path.
std::string read_file_bytes(const std::string& path);

// Reads a private key file, refusing one that group or others may access, as OpenSSH does for
// its identity files (ssh(1), "Permissions 0644 ... are too open"): any of the mode bits 077
// set throws data_error (exit 65) naming the file, its mode and the fix (`chmod 600 FILE`).
// The mode checked is that of the descriptor read (fstat), so the file cannot be swapped
// between the check and the read. Missing: no_input; unreadable: io_error.
std::string read_private_key_file(const std::string& path);
// Writes `bytes` to `path` atomically: a temp file beside it, fsync, rename. When `exclusive`,
// refuses (cant_create) if `path` exists. Nothing is left behind on failure.
// The data is durable when it returns (the fsync: a crash never leaves a named, partial file);
// the new name is durable once its folder is synced (sync_folders), which callers that write
// several files do once for all of them.
void write_file_atomic(const std::string& path, const std::string& bytes, bool exclusive);
// fsync of the folder holding each of `paths` (each folder once), so the names just linked
// there survive a crash. Throws io_error naming the folder.
void sync_folders(const std::vector<std::string>& paths);

}  // namespace sp::report
