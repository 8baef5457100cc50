// Settled waveforms as an ngspice raw file, so any waveform viewer that reads
// that format (ngspice's own `load`, among others) can open them.
#pragma once

#include <ostream>
#include <string>

#include "sim/waveforms.h"

namespace zvsmap {

/// The header lines of a raw file that are not derived from the data.
struct RawFileInfo {
  std::string title;  ///< "Title:" line (one line; newlines become spaces)
  std::string date;   ///< "Date:" line, e.g. from RawFileDate()
  std::string plotname = "Transient Analysis";  ///< "Plotname:" line
};

/// Writes `waves` in ngspice's ASCII raw-file format (the layout ngspice's
/// `write` command produces with `set filetype=ascii`): Title, Date,
/// Plotname, Flags: real, No. Variables, No. Points, Variables (index, name,
/// type: "time" for the axis, "voltage" for v(...), "current" for i(...),
/// "notype" otherwise), then Values, one block per time point with the point
/// number and the time, then each vector, in %.15e. Vector order: time first,
/// then Waveforms::Names() order. Returns false when the stream fails.
bool WriteRawFile(std::ostream& out, const Waveforms& waves, const RawFileInfo& info);

/// The current local time in the form ngspice writes on its "Date:" line
/// ("Tue Dec  1 23:21:25  2026").
std::string RawFileDate();

}  // namespace zvsmap
