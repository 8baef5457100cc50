// Hashes that decide what a rerun may keep: the sweep's identity and each
// point's content (no cryptography needed: they only detect change).
#pragma once

#include <cstdint>
#include <string>

#include "netlist/template.h"
#include "sweep/sweep_spec.h"

namespace zvsmap {

/// 64-bit FNV-1a of `data`, continuing from `basis` (Fowler, Noll & Vo; the
/// offset basis and prime are the published 64-bit constants).
uint64_t Fnv1a64(const std::string& data, uint64_t basis = 14695981039346656037ull);

/// 16 lower-case hex digits.
std::string HexHash(uint64_t hash);

/// The sweep's identity: the bytes of the sweep file and of its template.
/// A file that cannot be read contributes its path only.
std::string SweepIdentity(const std::string& sweep_path, const std::string& template_path);

/// A point's content hash: its canonical deck (`canonical_deck`, from
/// Deck::Canonical(): the assembled text with every file's contents inlined,
/// without title, comments and blank lines, so it names no path and no point
/// index), everything else that changes its measured result (simulation
/// settings, ZVS criterion, the template's `*@` annotations, blanks
/// collapsed, the sweep's `<predict>` elements) and the zvsmap version. Equal hashes mean the
/// stored result can be reused. When new sweep settings start to affect a point's result, add them
/// here.
std::string PointContentHash(const std::string& canonical_deck, const SweepSpec& spec,
                             const Template& tmpl);

}  // namespace zvsmap
