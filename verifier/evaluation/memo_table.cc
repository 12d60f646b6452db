#include "verifier/evaluation/memo_table.h"

namespace thetagate::engine {

namespace {
constexpr size_t kInitialSlots = 1024;
constexpr uint64_t kEntryMask = 0xffffffffULL;

uint64_t tag_of(uint64_t hash) { return hash >> 32; }
}  // namespace

size_t MemoTable::slot_of(const Value& key, uint64_t hash, bool& found) const {
  // Linear probing over a table at most three quarters full.
  size_t mask = index_.size() - 1;
  for (size_t slot = static_cast<size_t>(hash) & mask;; slot = (slot + 1) & mask) {
    uint64_t word = index_[slot];
    if (word == 0) {
      found = false;
      return slot;
    }
    if ((word >> 32) == tag_of(hash) && same_integer(entries_[(word & kEntryMask) - 1].key, key)) {
      found = true;
      return slot;
    }
  }
}

const Value* MemoTable::find(const Value& key) const {
  if (entries_.empty()) return nullptr;
  bool found = false;
  size_t slot = slot_of(key, IntegerValueHash()(key), found);
  return found ? &entries_[(index_[slot] & kEntryMask) - 1].value : nullptr;
}

std::pair<const Value*, bool> MemoTable::insert(const Value& key, const Value& value) {
  // At most three quarters full: probe runs stay short, and the index costs
  // at most 16 bytes per entry next to the entries themselves.
  if ((entries_.size() + 1) * 4 > index_.size() * 3) grow();
  uint64_t hash = IntegerValueHash()(key);
  bool found = false;
  size_t slot = slot_of(key, hash, found);
  if (found) return {&entries_[(index_[slot] & kEntryMask) - 1].value, false};
  if (entries_.size() >= kEntryMask)
    throw BudgetExceeded(Limit::kMemory, "more remembered values than a memo holds");
  entries_.push_back({key, value, hash});
  index_[slot] = (tag_of(hash) << 32) | entries_.size();
  return {&entries_.back().value, true};
}

void MemoTable::grow() {
  std::vector<uint64_t> old = std::move(index_);
  index_.assign(old.empty() ? kInitialSlots : old.size() * 2, 0);
  size_t mask = index_.size() - 1;
  for (uint64_t word : old) {
    if (word == 0) continue;
    uint64_t hash = entries_[(word & kEntryMask) - 1].hash;
    size_t slot = static_cast<size_t>(hash) & mask;
    while (index_[slot] != 0) slot = (slot + 1) & mask;
    index_[slot] = word;
  }
}

void MemoTable::clear() {
  entries_.clear();
  index_.clear();
}

}  // namespace thetagate::engine
