// The evaluator's memo: remembered values by integer size. Open addressing
// over a dense, append-only list of entries, so a lookup touches one index
// word before the key, and a remembered value never moves (callers keep
// pointers to it until clear()).
#ifndef THETAGATE_VERIFIER_EVALUATION_MEMO_TABLE_H_
#define THETAGATE_VERIFIER_EVALUATION_MEMO_TABLE_H_

#include <cstddef>
#include <cstdint>
#include <deque>
#include <utility>
#include <vector>

#include "verifier/numbers/value.h"

namespace thetagate::engine {

class MemoTable {
 public:
  // The value remembered for `key`, or null. REQUIRES: key is a canonical
  // integer (canonical_integer()).
  const Value* find(const Value& key) const;
  // Remembers value under key unless key is present. Returns the stored
  // value and whether it was inserted. REQUIRES: as for find().
  std::pair<const Value*, bool> insert(const Value& key, const Value& value);

  size_t size() const { return entries_.size(); }
  bool empty() const { return entries_.empty(); }
  // Forgets everything; pointers returned before become invalid.
  void clear();

 private:
  struct Entry {
    Value key;
    Value value;
    uint64_t hash;  // of key; growing never rereads the key's limbs
  };
  // Each index word: 0 when empty, else (hash tag << 32) | (entry + 1).
  size_t slot_of(const Value& key, uint64_t hash, bool& found) const;
  void grow();

  std::deque<Entry> entries_;
  std::vector<uint64_t> index_;
};

}  // namespace thetagate::engine

#endif  // THETAGATE_VERIFIER_EVALUATION_MEMO_TABLE_H_
