// orchard::find_sorted: binary search with a three-way comparison. Its probe
// count (calls of `compare`) is the claim "orchard::find_sorted / probes,
// worst case" (claims/search.toml): one probe, then at most floor(n/2) keys.
#ifndef ORCHARD_SEARCH_H_
#define ORCHARD_SEARCH_H_

#include <cstddef>
#include <optional>
#include <vector>

namespace orchard {

// The index of an element of the sorted `v` equal to `key`, if any.
// `compare(key, element)` returns a negative number, zero or a positive number.
template <class T, class Compare>
std::optional<size_t> find_sorted(const std::vector<T>& v, const T& key, Compare compare) {
  size_t lo = 0, len = v.size();
  while (len > 0) {
    size_t half = len / 2;
    size_t mid = lo + half;
    int c = compare(key, v[mid]);
    if (c == 0) return mid;
    if (c < 0) {
      len = half;  // the floor(len/2) keys left of mid
    } else {
      lo = mid + 1;
      len = len - half - 1;  // ceil(len/2) - 1 <= floor(len/2) keys right of mid
    }
  }
  return std::nullopt;
}

}  // namespace orchard

#endif  // ORCHARD_SEARCH_H_
