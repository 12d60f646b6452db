#include "verifier/evaluation/limb_memo.h"

#include <cstdlib>
#include <cstring>
#include <stdexcept>

namespace thetagate::engine {

namespace {
constexpr size_t kInitialSlots = 1024;
constexpr size_t kBlockLimbs = size_t{1} << 16;  // 512 KiB per arena block
// Zero has no limbs; its pointer must still mark a slot as used.
const mp_limb_t kNoLimbs[1] = {0};

uint32_t tag_of(uint64_t hash) { return static_cast<uint32_t>(hash >> 32); }

uint64_t mix(uint64_t h) {  // the splitmix64 finaliser
  h ^= h >> 30;
  h *= 0xbf58476d1ce4e5b9ULL;
  h ^= h >> 27;
  h *= 0x94d049bb133111ebULL;
  return h ^ (h >> 31);
}
}  // namespace

mpz_srcptr LimbView::as_mpz(mpz_t scratch) const { return mpz_roinit_n(scratch, limbs, size); }

uint64_t LimbMemo::hash_of(mpz_srcptr key) {
  // The lowest two limbs and the top one tell apart the sizes an evaluation
  // meets (neighbours differ low, scales differ in length): O(1) per key.
  int n = std::abs(key->_mp_size);
  uint64_t h = mix(static_cast<uint64_t>(static_cast<int64_t>(key->_mp_size)));
  if (n > 0) h = mix(h ^ key->_mp_d[0]);
  if (n > 1) h = mix(h ^ key->_mp_d[1]);
  if (n > 2) h = mix(h ^ key->_mp_d[n - 1]);
  return h;
}

size_t LimbMemo::slot_of(mpz_srcptr key, uint64_t hash) const {
  // Linear probing over an index at most half full: most lookups are of new
  // sizes, and a miss costs about 2.5 probes there (8.5 at three quarters).
  size_t mask = index_.size() - 1;
  int n = std::abs(key->_mp_size);
  for (size_t i = static_cast<size_t>(hash) & mask;; i = (i + 1) & mask) {
    uint64_t word = index_[i];
    if (word == 0) return i;
    if ((word >> 32) != tag_of(hash)) continue;
    const Entry& e = entries_[(word & 0xffffffffu) - 1];
    if (e.hash == hash && e.key_size == key->_mp_size &&
        (n == 0 || mpn_cmp(e.key, key->_mp_d, n) == 0)) {
      return i;
    }
  }
}

bool LimbMemo::find(mpz_srcptr key, LimbView& value) const {
  if (size_ == 0) return false;
  uint64_t word = index_[slot_of(key, hash_of(key))];
  if (word == 0) return false;
  const Entry& e = entries_[(word & 0xffffffffu) - 1];
  value = {e.value, e.value_size};
  return true;
}

const mp_limb_t* LimbMemo::store(mpz_srcptr x) {
  size_t n = static_cast<size_t>(std::abs(x->_mp_size));
  if (n == 0) return kNoLimbs;
  if (blocks_.empty() || block_used_ + n > block_size_) {
    block_size_ = std::max(kBlockLimbs, n);
    blocks_.push_back(std::make_unique_for_overwrite<mp_limb_t[]>(block_size_));
    block_used_ = 0;
  }
  mp_limb_t* out = blocks_.back().get() + block_used_;
  std::memcpy(out, x->_mp_d, n * sizeof(mp_limb_t));
  block_used_ += n;
  return out;
}

LimbView LimbMemo::insert(mpz_srcptr key, mpz_srcptr value) {
  if ((size_ + 1) * 2 > index_.size()) grow();
  uint64_t hash = hash_of(key);
  size_t slot = slot_of(key, hash);
  if (index_[slot] != 0) {
    const Entry& e = entries_[(index_[slot] & 0xffffffffu) - 1];
    return {e.value, e.value_size};
  }
  if (entries_.size() >= 0xffffffffu) throw std::length_error("a memo of 2^32 entries");
  entries_.push_back({store(key), store(value), key->_mp_size, value->_mp_size, hash});
  index_[slot] = (static_cast<uint64_t>(tag_of(hash)) << 32) | entries_.size();
  ++size_;
  return {entries_.back().value, entries_.back().value_size};
}

void LimbMemo::grow() {
  index_.assign(index_.empty() ? kInitialSlots : index_.size() * 2, 0);
  size_t mask = index_.size() - 1;
  for (size_t k = 0; k < entries_.size(); ++k) {
    uint64_t hash = entries_[k].hash;
    size_t i = static_cast<size_t>(hash) & mask;
    while (index_[i] != 0) i = (i + 1) & mask;
    index_[i] = (static_cast<uint64_t>(tag_of(hash)) << 32) | (k + 1);
  }
}

void LimbMemo::clear() {
  entries_.clear();
  index_.clear();
  size_ = 0;
  blocks_.clear();
  block_used_ = 0;
  block_size_ = 0;
}

}  // namespace thetagate::engine
