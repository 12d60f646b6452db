// The integer kernel's memo: big-integer keys and values stored as raw GMP
// limbs in an append-only arena, indexed by open addressing. No allocation
// per entry (the arena grows in large blocks) and no shared ownership: a
// lookup touches the slot and then the key's limbs.
#ifndef THETAGATE_VERIFIER_LIMB_MEMO_H_
#define THETAGATE_VERIFIER_LIMB_MEMO_H_

#include <gmp.h>

#include <cstddef>
#include <cstdint>
#include <memory>
#include <vector>

namespace thetagate {

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
  struct Slot {
    uint64_t hash = 0;
    const mp_limb_t* key = nullptr;  // null: empty slot
    const mp_limb_t* value = nullptr;
    int key_size = 0;
    int value_size = 0;
  };
  static uint64_t hash_of(mpz_srcptr key);
  size_t slot_of(mpz_srcptr key, uint64_t hash) const;
  const mp_limb_t* store(mpz_srcptr x);
  void grow();

  std::vector<Slot> slots_;
  size_t size_ = 0;
  std::vector<std::unique_ptr<mp_limb_t[]>> blocks_;
  size_t block_used_ = 0;
  size_t block_size_ = 0;
};

}  // namespace thetagate

#endif  // THETAGATE_VERIFIER_LIMB_MEMO_H_
