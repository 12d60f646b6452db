// Text that reaches a terminal. Names, notes, paths and messages come from
// files a stranger may have written: a claim name holding ESC ] 0 ; ... BEL
// would retitle the reader's terminal, ESC [ 2 J would clear it, and the C1
// control U+009B is a one-character CSI on many terminals. Every text the
// tool prints goes through one of these two functions, so no byte of input
// ever acts as a control. Dependency-free: the command line compiles this
// file into itself (it links only the public library).
#ifndef THETAGATE_VERIFIER_SYNTAX_TERMINAL_TEXT_H_
#define THETAGATE_VERIFIER_SYNTAX_TERMINAL_TEXT_H_

#include <cstdint>
#include <string>

namespace thetagate::engine {

// `s` with every control written out: C0 bytes (NUL, ESC, line breaks, tab)
// and DEL as \xNN, the C1 controls U+0080..U+009F and the bidirectional
// overrides and isolates (U+202A..U+202E, U+2066..U+2069, which reorder what
// a reader sees) as \uNNNN, and bytes that are not UTF-8 as \xNN. For one
// field: a name, a path, a message.
std::string escape_controls(const std::string& s);

// A whole rendered text (a report, an error message) made safe for a
// terminal: like escape_controls, but line breaks and tabs stay, and with
// `keep_colour` the colour sequences ESC [ digits;... m stay too (the
// reports' own colours: they change only colours, never move the cursor,
// retitle, or clear). Never throws (except std::bad_alloc).
std::string terminal_safe(const std::string& text, bool keep_colour = false);

// `line` with every character escape_controls would write out (and every
// byte that is not UTF-8) replaced by one '?', so a caret placed under a
// column of the original still lines up. Tabs stay. For the source line
// under an error message.
std::string masked_line(const std::string& line);

// Serialised JSON with the C1 controls and bidirectional overrides written
// as \uNNNN escapes (a JSON writer escapes only U+0000..U+001F), so a
// report printed with `cat` cannot act on a terminal either. Requires valid
// UTF-8 in which these code points occur only inside strings (true of any
// serialised JSON).
std::string json_escape_controls(const std::string& json);

// True for the code points escape_controls writes out: C0, DEL, C1 and the
// bidirectional overrides and isolates. The one list every writer uses.
bool is_control_code_point(uint32_t cp);

// True when `s` holds no byte that escape_controls would write out.
bool is_plain_text(const std::string& s);

}  // namespace thetagate::engine

#endif  // THETAGATE_VERIFIER_SYNTAX_TERMINAL_TEXT_H_
