// The integer kernel's memo: big-integer keys and values stored as raw GMP
// limbs in an append-only arena, entries kept densely in insertion order, and
// an open-addressing index of 8-byte words (a 32-bit hash tag and the entry's
// number). No allocation per entry (the arena grows in large blocks) and no
// shared ownership. Most lookups are of sizes not seen yet: they touch only
// the compact index, which stays in cache far longer than the entries would.
#ifndef THETAGATE_VERIFIER_EVALUATION_LIMB_MEMO_H_
#define THETAGATE_VERIFIER_EVALUATION_LIMB_MEMO_H_

#include <gmp.h>

#include <cstddef>
#include <cstdint>
#include <memory>
#include <vector>

namespace thetagate::engine {

// A stored integer, readable as a GMP integer without copying.
struct LimbView {
  const mp_limb_t* limbs = nullptr;
  int size = 0;  // GMP's signed size: |size| limbs, the sign of the integer
  // A read-only mpz over the limbs (mpz_roinit_n); valid while the memo is.
  mpz_srcptr as_mpz(mpz_t scratch) const;
};

class LimbMemo {
 public:
  // Finds key's value. Returns false if key was never inserted.
  bool find(mpz_srcptr key, LimbView& value) const;
  // Remembers value under key unless key is present; returns the stored
  // value either way. Views stay valid until clear(): blocks never move.
  LimbView insert(mpz_srcptr key, mpz_srcptr value);

  size_t size() const { return size_; }
  void clear();

 private:
  struct Entry {
    const mp_limb_t* key;
    const mp_limb_t* value;
    int key_size;
    int value_size;
    uint64_t hash;  // growing never rereads the key
  };
  static uint64_t hash_of(mpz_srcptr key);
  // The index slot holding key, or the empty slot where it would go.
  size_t slot_of(mpz_srcptr key, uint64_t hash) const;
  const mp_limb_t* store(mpz_srcptr x);
  void grow();

  std::vector<Entry> entries_;
  std::vector<uint64_t> index_;  // 0: empty; else (hash tag << 32) | (entry number + 1)
  size_t size_ = 0;
  std::vector<std::unique_ptr<mp_limb_t[]>> blocks_;
  size_t block_used_ = 0;
  size_t block_size_ = 0;
};

}  // namespace thetagate::engine

#endif  // THETAGATE_VERIFIER_EVALUATION_LIMB_MEMO_H_
