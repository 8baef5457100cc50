// What a deck may contain: an allow-list of cards, checked on every card of
// every file zvsmap reads for a deck (template, included files, model files),
// and the token rules for sweep-file values that reach a deck. See README
// "What a template may contain". The rules follow ngspice 39's input reader
// (src/frontend/inpcom.c, inp.c): it strips leading blanks, matches
// `.control`, `.endc`, `.inc` and `.lib` as case-insensitive prefixes, runs
// `*#` lines as commands, and stops reading at a line starting with '@'.
#pragma once

#include <string>

namespace zvsmap {

/// What a card is, for the deck assembler.
enum class CardKind {
  kBlank,         ///< nothing but blanks
  kComment,       ///< '*' comment (also zvsmap's `*@` annotations)
  kContinuation,  ///< '+' line, joined to the card before it
  kElement,       ///< a circuit element (first character a letter)
  kKept,          ///< an allowed control card passed to ngspice (.param, .model, ...)
  kDropped,       ///< an analysis or output card zvsmap replaces (.tran, .save, ...)
  kInclude,       ///< `.include FILE` / `.inc FILE`: zvsmap inlines the file
  kLibrary,       ///< `.lib FILE SECTION` (inline a section) or `.lib SECTION` (define one)
  kEndLibrary,    ///< `.endl`
  kEnd,           ///< `.end`
};

/// A classified card: its kind and, for control cards, the keyword (lower-case).
struct CardClass {
  CardKind kind = CardKind::kBlank;
  std::string keyword;
};

/// Classifies one physical or logical card. False with `reason` and the
/// 1-based `column` of the offending text for every card ngspice could read
/// as a command or as the start of a control section or script, every
/// control card not on the allow-list, and refused `.options`.
bool ClassifyCard(const std::string& card, CardClass* out, std::string* reason, int* column);

/// Checks the option names of an `.options` card (`body` = the text after
/// the keyword). False with `reason` for an option that is refused (e.g.
/// `interp`, which interpolates the saved data onto the print step) or not on
/// the allow-list.
bool CheckOptions(const std::string& body, std::string* reason);

/// Position (0-based) of the first character of `text` that can never be
/// part of a deck value: a control character (CR, LF, tab excepted when
/// `allow_tab`) or a non-ASCII byte; npos when there is none.
size_t FindForbiddenChar(const std::string& text, bool allow_tab);

/// Checks a sweep value that becomes a parameter list on an instance card
/// (`<device params="name=value ...">`): each item is `name=value` where the
/// name is a SPICE identifier and the value a number or a braced/quoted
/// expression of identifiers, numbers and operators. False with `reason`.
bool CheckParamListToken(const std::string& text, std::string* reason);

/// True for a SPICE name token: letters, digits and `_ . : # [ ] - $ /`
/// only, not starting with a character that begins a card ('.', '*', '+').
bool IsNameToken(const std::string& text);

/// Describes byte `c` for messages: "line break (LF)", "control character 0x07".
std::string DescribeChar(unsigned char c);

/// Checks a file name that zvsmap reads for a deck: false with `reason` when
/// it holds a control character (a line break in a name is refused, never
/// passed on).
bool CheckFileName(const std::string& path, std::string* reason);

}  // namespace zvsmap
