// Whole-file writes that never leave a truncated file behind: the text goes
// to a temporary file in the same directory, is flushed to the disk and then
// renamed over the target (rename(2) replaces a name in one step).
#pragma once

#include <string>

namespace zvsmap {

/// "PATH: WHAT: <the OS's reason for errno_value>", e.g.
/// "out/edges.csv: cannot write: No space left on device".
std::string OsErrorMessage(const std::string& path, const std::string& what, int errno_value);

/// Writes `contents` as the file `path`: afterwards `path` holds either its
/// old contents (or is still absent) or exactly `contents`, even when the disk
/// fills or the process dies midway. The data is fsync'ed before the rename
/// and the directory after it; the new file gets mode 0666 minus the umask.
/// Returns false with `error` naming `path` and the OS's reason (see
/// OsErrorMessage; what is "cannot write" for creating, writing, flushing or
/// closing the temporary file, "cannot replace" for the rename); the
/// temporary file is then removed.
bool WriteFileAtomically(const std::string& path, const std::string& contents, std::string* error);

/// The name of the temporary file WriteFileAtomically uses for `path` in this
/// process: "DIR/.NAME.tmp-PID" (hidden; a leftover after a crash is harmless
/// and is replaced by the next write of NAME from a process with that pid).
std::string AtomicTempPath(const std::string& path);

}  // namespace zvsmap
